import { Link } from "react-router";
import { NameMark } from "./name-mark";

export function SiteFooter() {
  return (
    <footer className="site-footer">
      <div className="site-footer-grid">
        <div className="space-y-3">
          <NameMark />
          <p className="max-w-sm text-sm text-ink-600">
            Used machine tools with their geometric accuracy measured on site by certified inspectors and scored
            against published tolerance tables.
          </p>
        </div>
        <div>
          <h2 className="ui-eyebrow">Marketplace</h2>
          <ul className="mt-3 space-y-2 text-sm">
            <li><Link className="site-footer-link" to="/machines">Machines for sale</Link></li>
            <li><Link className="site-footer-link" to="/inspectors">Find an inspector</Link></li>
            <li><Link className="site-footer-link" to="/sell">List a machine</Link></li>
          </ul>
        </div>
      </div>
      <div className="site-footer-end">© {new Date().getFullYear()} Tenthmark</div>
    </footer>
  );
}
