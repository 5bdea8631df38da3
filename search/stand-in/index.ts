// The local stand-in for the hosted search engine; see search/README.md for what it speaks.
export { startSearchStandIn, type SearchStandIn, type SearchStandInOptions } from "./server.ts";
