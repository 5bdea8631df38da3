import { PassThrough } from "node:stream";
import { createReadableStreamFromReadable } from "@react-router/node";
import { Link, Links, Meta, NavLink, Outlet, Scripts, ScrollRestoration, ServerRouter, UNSAFE_withComponentProps, UNSAFE_withErrorBoundaryProps, createContext, isRouteErrorResponse, useRouteLoaderData } from "react-router";
import { isbot } from "isbot";
import { renderToPipeableStream } from "react-dom/server";
import { Fragment, jsx, jsxs } from "react/jsx-runtime";
import { createContext as createContext$1, useCallback, useState } from "react";
import * as RadixToast from "@radix-ui/react-toast";
import { drizzle } from "drizzle-orm/node-postgres";
import pg from "pg";
import { z } from "zod";
import { sql } from "drizzle-orm";
// \0rolldown/runtime.js
var __defProp = Object.defineProperty;
var __exportAll = (all, no_symbols) => {
	let target = {};
	for (var name in all) __defProp(target, name, {
		get: all[name],
		enumerable: true
	});
	if (!no_symbols) __defProp(target, Symbol.toStringTag, { value: "Module" });
	return target;
};
// node_modules/@react-router/dev/dist/config/defaults/entry.server.node.tsx
var entry_server_node_exports = /* @__PURE__ */ __exportAll({
	default: () => handleRequest,
	streamTimeout: () => streamTimeout
});
var streamTimeout = 5e3;
function handleRequest(request, responseStatusCode, responseHeaders, routerContext, loadContext) {
	if (request.method.toUpperCase() === "HEAD") return new Response(null, {
		status: responseStatusCode,
		headers: responseHeaders
	});
	return new Promise((resolve, reject) => {
		let shellRendered = false;
		let userAgent = request.headers.get("user-agent");
		let readyOption = userAgent && isbot(userAgent) || routerContext.isSpaMode ? "onAllReady" : "onShellReady";
		let timeoutId = setTimeout(() => abort(), 6e3);
		const { pipe, abort } = renderToPipeableStream(/* @__PURE__ */ jsx(ServerRouter, {
			context: routerContext,
			url: request.url
		}), {
			[readyOption]() {
				shellRendered = true;
				const body = new PassThrough({ final(callback) {
					clearTimeout(timeoutId);
					timeoutId = void 0;
					callback();
				} });
				const stream = createReadableStreamFromReadable(body);
				responseHeaders.set("Content-Type", "text/html");
				pipe(body);
				resolve(new Response(stream, {
					headers: responseHeaders,
					status: responseStatusCode
				}));
			},
			onShellError(error) {
				reject(error);
			},
			onError(error) {
				responseStatusCode = 500;
				if (shellRendered) console.error(error);
			}
		});
	});
}
// app/components/layout/name-mark.tsx
/**
* The Tenthmark mark: a ruled scale whose one long graduation is picked out in brass — a tenth of a
* thousandth is the reading the trade cares about.
*/
function NameMark({ className }) {
	return /* @__PURE__ */ jsxs("span", {
		className: `inline-flex items-center gap-2 ${className ?? ""}`,
		children: [/* @__PURE__ */ jsxs("svg", {
			viewBox: "0 0 28 28",
			className: "size-7",
			"aria-hidden": "true",
			children: [/* @__PURE__ */ jsx("rect", {
				x: "1",
				y: "1",
				width: "26",
				height: "26",
				rx: "6",
				fill: "var(--color-ink-900)"
			}), [
				6,
				10,
				14,
				18,
				22
			].map((x) => /* @__PURE__ */ jsx("rect", {
				x: x - .75,
				y: x === 14 ? 6 : 13,
				width: "1.5",
				height: x === 14 ? 16 : 9,
				rx: "0.75",
				fill: x === 14 ? "var(--color-brass-400)" : "var(--color-ink-300)"
			}, x))]
		}), /* @__PURE__ */ jsxs("span", {
			className: "text-lg font-extrabold tracking-tight text-ink-900",
			children: ["Tenth", /* @__PURE__ */ jsx("span", {
				className: "text-brass-600",
				children: "mark"
			})]
		})]
	});
}
// app/components/layout/site-footer.tsx
function SiteFooter() {
	return /* @__PURE__ */ jsxs("footer", {
		className: "mt-16 border-t border-ink-200 bg-white",
		children: [/* @__PURE__ */ jsxs("div", {
			className: "mx-auto grid max-w-6xl gap-8 px-4 py-10 sm:px-6 md:grid-cols-[1.4fr_1fr_1fr]",
			children: [
				/* @__PURE__ */ jsxs("div", {
					className: "space-y-3",
					children: [/* @__PURE__ */ jsx(NameMark, {}), /* @__PURE__ */ jsx("p", {
						className: "max-w-sm text-sm text-ink-600",
						children: "Used machine tools with their geometric accuracy measured on site by certified inspectors and scored against published tolerance tables."
					})]
				}),
				/* @__PURE__ */ jsxs("div", { children: [/* @__PURE__ */ jsx("h2", {
					className: "text-xs font-bold uppercase tracking-wide text-ink-500",
					children: "Marketplace"
				}), /* @__PURE__ */ jsxs("ul", {
					className: "mt-3 space-y-2 text-sm",
					children: [
						/* @__PURE__ */ jsx("li", { children: /* @__PURE__ */ jsx(Link, {
							className: "text-ink-700 hover:text-ink-900",
							to: "/machines",
							children: "Machines for sale"
						}) }),
						/* @__PURE__ */ jsx("li", { children: /* @__PURE__ */ jsx(Link, {
							className: "text-ink-700 hover:text-ink-900",
							to: "/inspectors",
							children: "Find an inspector"
						}) }),
						/* @__PURE__ */ jsx("li", { children: /* @__PURE__ */ jsx(Link, {
							className: "text-ink-700 hover:text-ink-900",
							to: "/sell",
							children: "List a machine"
						}) })
					]
				})] }),
				/* @__PURE__ */ jsxs("div", { children: [/* @__PURE__ */ jsx("h2", {
					className: "text-xs font-bold uppercase tracking-wide text-ink-500",
					children: "Working safely"
				}), /* @__PURE__ */ jsx("p", {
					className: "mt-3 text-sm text-ink-600",
					children: "Moving, wiring and testing machine tools is hazardous work. Follow the machine's manual, local codes and licensed practice; use qualified riggers and a licensed electrician."
				})] })
			]
		}), /* @__PURE__ */ jsxs("div", {
			className: "border-t border-ink-100 py-4 text-center text-xs text-ink-500",
			children: [
				"© ",
				(/* @__PURE__ */ new Date()).getFullYear(),
				" Tenthmark"
			]
		})]
	});
}
// app/components/ui/cx.ts
/** Joins class names, skipping the empty ones. */
function cx(...parts) {
	return parts.filter(Boolean).join(" ");
}
// app/components/ui/button.tsx
var base = "inline-flex items-center justify-center gap-2 rounded-(--radius-control) font-semibold transition-colors disabled:cursor-not-allowed disabled:opacity-55 whitespace-nowrap";
var variants = {
	primary: "bg-ink-900 text-white hover:bg-ink-700 shadow-sm",
	secondary: "bg-white text-ink-900 ring-1 ring-inset ring-ink-300 hover:bg-ink-50",
	quiet: "text-ink-700 hover:bg-ink-100",
	danger: "bg-beyond text-white hover:bg-[#8f1e18]"
};
var sizes = {
	sm: "h-8 px-3 text-sm",
	md: "h-10 px-4 text-sm",
	lg: "h-12 px-6 text-base"
};
function buttonClasses(variant = "primary", size = "md", extra) {
	return cx(base, variants[variant], sizes[size], extra);
}
function ButtonLink({ variant = "primary", size = "md", className, children, ...props }) {
	return /* @__PURE__ */ jsx(Link, {
		className: buttonClasses(variant, size, className),
		...props,
		children
	});
}
// app/components/ui/card.tsx
function Card({ className, ...props }) {
	return /* @__PURE__ */ jsx("div", {
		className: cx("rounded-(--radius-panel) border border-ink-200 bg-white shadow-(--shadow-panel)", className),
		...props
	});
}
// app/components/ui/toast.tsx
var ToastContext = createContext$1(() => {});
/** Short-lived notices ("Listing published"), announced politely to screen readers by Radix. */
function ToastProvider({ children }) {
	const [messages, setMessages] = useState([]);
	const show = useCallback((message) => {
		setMessages((current) => [...current, {
			...message,
			id: Date.now() + Math.random()
		}]);
	}, []);
	return /* @__PURE__ */ jsx(ToastContext.Provider, {
		value: show,
		children: /* @__PURE__ */ jsxs(RadixToast.Provider, {
			swipeDirection: "right",
			duration: 6e3,
			children: [
				children,
				messages.map((message) => /* @__PURE__ */ jsxs(RadixToast.Root, {
					onOpenChange: (open) => {
						if (!open) setMessages((current) => current.filter((m) => m.id !== message.id));
					},
					className: cx("rounded-(--radius-panel) border bg-white p-4 shadow-lg", message.tone === "error" ? "border-beyond" : message.tone === "success" ? "border-within" : "border-ink-200"),
					children: [/* @__PURE__ */ jsx(RadixToast.Title, {
						className: "text-sm font-bold text-ink-900",
						children: message.title
					}), message.description ? /* @__PURE__ */ jsx(RadixToast.Description, {
						className: "mt-1 text-sm text-ink-600",
						children: message.description
					}) : null]
				}, message.id)),
				/* @__PURE__ */ jsx(RadixToast.Viewport, { className: "fixed bottom-4 right-4 z-50 flex w-[min(92vw,24rem)] flex-col gap-2 outline-none" })
			]
		})
	});
}
// app/components/layout/site-header.tsx
var navigation = [
	{
		to: "/machines",
		label: "Machines"
	},
	{
		to: "/inspectors",
		label: "Inspectors"
	},
	{
		to: "/sell",
		label: "Sell a machine"
	},
	{
		to: "/how-scoring-works",
		label: "How scoring works"
	}
];
function SiteHeader({ user }) {
	const [menuOpen, setMenuOpen] = useState(false);
	return /* @__PURE__ */ jsxs("header", {
		className: "sticky top-0 z-30 border-b border-ink-200 bg-paper/95 backdrop-blur",
		children: [/* @__PURE__ */ jsxs("div", {
			className: "mx-auto flex h-16 max-w-6xl items-center gap-6 px-4 sm:px-6",
			children: [
				/* @__PURE__ */ jsx(Link, {
					to: "/",
					"aria-label": "Tenthmark home",
					className: "shrink-0",
					children: /* @__PURE__ */ jsx(NameMark, {})
				}),
				/* @__PURE__ */ jsx("nav", {
					"aria-label": "Main",
					className: "hidden flex-1 items-center gap-1 md:flex",
					children: navigation.map((item) => /* @__PURE__ */ jsx(NavLink, {
						to: item.to,
						className: ({ isActive }) => cx("rounded-(--radius-control) px-3 py-2 text-sm font-semibold", isActive ? "bg-ink-100 text-ink-900" : "text-ink-600 hover:text-ink-900"),
						children: item.label
					}, item.to))
				}),
				/* @__PURE__ */ jsx("div", {
					className: "ml-auto hidden items-center gap-2 md:flex",
					"data-slot": "account",
					children: /* @__PURE__ */ jsx(AccountSlot, { user })
				}),
				/* @__PURE__ */ jsxs("button", {
					type: "button",
					className: "ml-auto rounded-(--radius-control) p-2 text-ink-700 hover:bg-ink-100 md:hidden",
					"aria-expanded": menuOpen,
					"aria-controls": "mobile-navigation",
					onClick: () => setMenuOpen((open) => !open),
					children: [/* @__PURE__ */ jsx("span", {
						className: "sr-only",
						children: menuOpen ? "Close menu" : "Open menu"
					}), /* @__PURE__ */ jsx("svg", {
						viewBox: "0 0 20 20",
						className: "size-6",
						"aria-hidden": "true",
						children: /* @__PURE__ */ jsx("path", {
							d: menuOpen ? "M5 5l10 10M15 5L5 15" : "M3 6h14M3 10h14M3 14h14",
							stroke: "currentColor",
							strokeWidth: "1.8",
							strokeLinecap: "round"
						})
					})]
				})
			]
		}), menuOpen ? /* @__PURE__ */ jsxs("nav", {
			id: "mobile-navigation",
			"aria-label": "Main",
			className: "border-t border-ink-200 bg-paper px-4 pb-4 md:hidden",
			children: [/* @__PURE__ */ jsx("ul", {
				className: "flex flex-col py-2",
				children: navigation.map((item) => /* @__PURE__ */ jsx("li", { children: /* @__PURE__ */ jsx(NavLink, {
					to: item.to,
					onClick: () => setMenuOpen(false),
					className: "block rounded px-2 py-3 text-base font-semibold text-ink-800",
					children: item.label
				}) }, item.to))
			}), /* @__PURE__ */ jsx("div", {
				className: "flex gap-2",
				"data-slot": "account",
				children: /* @__PURE__ */ jsx(AccountSlot, { user })
			})]
		}) : null]
	});
}
function AccountSlot({ user }) {
	if (user) return /* @__PURE__ */ jsxs(Fragment, { children: [/* @__PURE__ */ jsx(ButtonLink, {
		to: "/account",
		variant: "quiet",
		size: "sm",
		children: user.name
	}), /* @__PURE__ */ jsx("form", {
		method: "post",
		action: "/sign-out",
		children: /* @__PURE__ */ jsx("button", {
			type: "submit",
			className: "rounded-(--radius-control) px-3 py-1.5 text-sm font-semibold text-ink-600 hover:bg-ink-100",
			children: "Sign out"
		})
	})] });
	return /* @__PURE__ */ jsxs(Fragment, { children: [/* @__PURE__ */ jsx(ButtonLink, {
		to: "/sign-in",
		variant: "quiet",
		size: "sm",
		children: "Sign in"
	}), /* @__PURE__ */ jsx(ButtonLink, {
		to: "/sign-up",
		size: "sm",
		children: "Create account"
	})] });
}
// app/env.server.ts
/**
* Every setting the server reads, validated once at boot. Each service is configured here alone, so
* pointing the app at a hosted service instead of its local stand-in is a change of environment.
*/
var environmentSchema = z.object({
	NODE_ENV: z.enum([
		"development",
		"production",
		"test"
	]).default("development"),
	DATABASE_URL: z.string({ error: "is required (a postgres:// connection string)" }).regex(/^postgres(ql)?:\/\//, { error: "must be a postgres:// or postgresql:// connection string" }),
	APP_ORIGIN: z.url({ error: "must be the public origin of the app, e.g. http://localhost:3000" }).default("http://localhost:3000"),
	SESSION_SECRET: z.string().min(32, { error: "must be at least 32 characters (generate one with `openssl rand -hex 32`)" }).default("development-only-secret-change-me-0123456789")
});
var EnvironmentError = class extends Error {
	name = "EnvironmentError";
};
/** Parses a variables object; the message names every bad variable and what it must be. */
function parseEnvironment(source) {
	const result = environmentSchema.safeParse(source);
	if (result.success) return result.data;
	throw new EnvironmentError(`Invalid environment:\n${result.error.issues.map((issue) => `  ${issue.path.join(".")}: ${issue.message}`).join("\n")}`);
}
var cached;
function env() {
	cached ??= parseEnvironment(process.env);
	return cached;
}
// app/db/schema.ts
var schema_exports = /* @__PURE__ */ __exportAll({});
// app/db/client.server.ts
var database;
/** The one Drizzle client of this process, created on first use. */
function getDatabase() {
	if (!database) {
		const pool = new pg.Pool({
			connectionString: env().DATABASE_URL,
			max: 10,
			connectionTimeoutMillis: 2e3
		});
		pool.on("error", () => {});
		database = drizzle(pool, { schema: schema_exports });
	}
	return database;
}
// app/db/context.ts
/** The Drizzle client, set by the root middleware and read by loaders and actions. */
var databaseContext = createContext();
// app/db/middleware.server.ts
/** Hands the process's one Drizzle client to every loader and action through the router context. */
var databaseMiddleware = ({ context }, next) => {
	context.set(databaseContext, getDatabase());
	return next();
};
// app/root.tsx
var root_exports = /* @__PURE__ */ __exportAll({
	ErrorBoundary: () => ErrorBoundary,
	Layout: () => Layout,
	default: () => root_default,
	loader: () => loader$1,
	meta: () => meta$2,
	middleware: () => middleware
});
var middleware = [databaseMiddleware];
async function loader$1(_) {
	return { user: null };
}
var meta$2 = () => [{ title: "Tenthmark — used machine tools with verified accuracy" }, {
	name: "description",
	content: "Buy and sell used lathes and machine tools with on-site geometric accuracy reports from certified inspectors."
}];
function Layout({ children }) {
	const data = useRouteLoaderData("root");
	return /* @__PURE__ */ jsxs("html", {
		lang: "en",
		children: [/* @__PURE__ */ jsxs("head", { children: [
			/* @__PURE__ */ jsx("meta", { charSet: "utf-8" }),
			/* @__PURE__ */ jsx("meta", {
				name: "viewport",
				content: "width=device-width, initial-scale=1"
			}),
			/* @__PURE__ */ jsx("meta", {
				name: "theme-color",
				content: "#17212b"
			}),
			/* @__PURE__ */ jsx("link", {
				rel: "icon",
				href: "/favicon.svg",
				type: "image/svg+xml"
			}),
			/* @__PURE__ */ jsx(Meta, {}),
			/* @__PURE__ */ jsx(Links, {})
		] }), /* @__PURE__ */ jsxs("body", {
			className: "flex min-h-screen flex-col",
			children: [
				/* @__PURE__ */ jsx("a", {
					href: "#main",
					className: "sr-only focus:not-sr-only focus:absolute focus:left-4 focus:top-4 focus:z-50 focus:rounded focus:bg-white focus:px-3 focus:py-2",
					children: "Skip to content"
				}),
				/* @__PURE__ */ jsxs(ToastProvider, { children: [
					/* @__PURE__ */ jsx(SiteHeader, { user: data?.user ?? null }),
					/* @__PURE__ */ jsx("main", {
						id: "main",
						className: "flex-1",
						children
					}),
					/* @__PURE__ */ jsx(SiteFooter, {})
				] }),
				/* @__PURE__ */ jsx(ScrollRestoration, {}),
				/* @__PURE__ */ jsx(Scripts, {})
			]
		})]
	});
}
var root_default = UNSAFE_withComponentProps(function App() {
	return /* @__PURE__ */ jsx(Outlet, {});
});
var ErrorBoundary = UNSAFE_withErrorBoundaryProps(function ErrorBoundary({ error }) {
	let title = "Something went wrong";
	let detail = "The page could not be shown. Try again in a moment; if it keeps happening, tell us what you were doing.";
	if (isRouteErrorResponse(error)) {
		if (error.status === 404) {
			title = "Page not found";
			detail = "There is nothing at this address. The listing may have been withdrawn, or the link mistyped.";
		} else if (error.status === 403) {
			title = "Not allowed";
			detail = typeof error.data === "string" && error.data ? error.data : "Your account does not have access to this page. Sign in with an account that does, or go back.";
		} else {
			title = `${error.status} ${error.statusText}`;
			if (typeof error.data === "string" && error.data) detail = error.data;
		}
	}
	return /* @__PURE__ */ jsxs("section", {
		className: "mx-auto max-w-2xl px-4 py-20 text-center sm:px-6",
		children: [
			/* @__PURE__ */ jsx("p", {
				className: "text-sm font-bold uppercase tracking-wide text-brass-600",
				children: "Tenthmark"
			}),
			/* @__PURE__ */ jsx("h1", {
				className: "mt-2 text-3xl font-extrabold text-ink-900",
				children: title
			}),
			/* @__PURE__ */ jsx("p", {
				className: "mt-4 text-ink-600",
				children: detail
			}),
			/* @__PURE__ */ jsx(Link, {
				to: "/",
				className: "mt-8 inline-block font-semibold text-ink-900 underline underline-offset-4",
				children: "Back to the home page"
			})
		]
	});
});
// app/routes/home.tsx
var home_exports = /* @__PURE__ */ __exportAll({
	default: () => home_default,
	meta: () => meta$1
});
var meta$1 = () => [{ title: "Tenthmark — used machine tools with verified accuracy" }];
var audiences = [
	{
		key: "dealers",
		heading: "For dealers",
		title: "Show the work you put into a rebuild",
		body: "List a reconditioned lathe with its specification and photos, then have a certified inspector measure it. A scored report on the listing tells buyers what a photo cannot: how the spindle runs and how the bed lies.",
		action: {
			to: "/sign-up?role=seller",
			label: "List a machine"
		}
	},
	{
		key: "buyers",
		heading: "For buyers",
		title: "Filter by measured accuracy, not adjectives",
		body: "Search machines by verified spindle run-out, axial slip and spindle-axis parallelism, in micrometres or inches. Before you travel, book an independent inspector and pay through the site.",
		action: {
			to: "/sign-up",
			label: "Start a search account"
		}
	},
	{
		key: "inspectors",
		heading: "For inspectors",
		title: "Get booked for on-site geometry checks",
		body: "Set your regions, fee and free slots. Enter readings on a tablet at the machine; the server scores every test against the tolerance table for that size of machine and publishes a signed report.",
		action: {
			to: "/sign-up?role=inspector",
			label: "Apply as an inspector"
		}
	}
];
var measured = [
	["Spindle run-out", "Total indicator reading on the nose and on a test mandrel in the taper"],
	["Axial slip", "Periodic end movement of the spindle, read on a ball in the centre hole"],
	["Spindle-axis parallelism", "Test mandrel read near and far, at 0° and 180°, in both planes"],
	["Bed straightness", "Level readings along the carriage travel against a reference straight line"],
	["Centre height", "Tailstock centre against headstock centre, which may sit high but never low"],
	["Leadscrew error", "Cumulative pitch error over any window of the travel"]
];
var home_default = UNSAFE_withComponentProps(function Home() {
	return /* @__PURE__ */ jsxs(Fragment, { children: [
		/* @__PURE__ */ jsx("section", {
			className: "border-b border-ink-200 bg-white",
			children: /* @__PURE__ */ jsxs("div", {
				className: "mx-auto grid max-w-6xl gap-10 px-4 py-14 sm:px-6 md:grid-cols-[1.25fr_1fr] md:py-20",
				children: [/* @__PURE__ */ jsxs("div", { children: [
					/* @__PURE__ */ jsx("p", {
						className: "text-sm font-bold uppercase tracking-wide text-brass-600",
						children: "Used machine tools, measured"
					}),
					/* @__PURE__ */ jsx("h1", {
						className: "mt-3 text-3xl font-extrabold leading-tight tracking-tight text-ink-950 sm:text-4xl",
						children: "Buy a used lathe knowing how true it runs."
					}),
					/* @__PURE__ */ jsx("p", {
						className: "mt-5 max-w-xl text-lg text-ink-600",
						children: "Tenthmark is a marketplace where each machine can carry an on-site geometry report: readings taken by a certified inspector, scored by our server against tolerance tables for that class and size of machine."
					}),
					/* @__PURE__ */ jsxs("div", {
						className: "mt-8 flex flex-wrap gap-3",
						children: [/* @__PURE__ */ jsx(ButtonLink, {
							to: "/sign-up?role=seller",
							size: "lg",
							children: "List a machine"
						}), /* @__PURE__ */ jsx(ButtonLink, {
							to: "/how-scoring-works",
							variant: "secondary",
							size: "lg",
							children: "How scoring works"
						})]
					})
				] }), /* @__PURE__ */ jsx(SampleReading, {})]
			})
		}),
		/* @__PURE__ */ jsxs("section", {
			"aria-labelledby": "audiences",
			className: "mx-auto max-w-6xl px-4 py-14 sm:px-6",
			children: [/* @__PURE__ */ jsx("h2", {
				id: "audiences",
				className: "sr-only",
				children: "Who Tenthmark is for"
			}), /* @__PURE__ */ jsx("div", {
				className: "grid gap-5 md:grid-cols-3",
				children: audiences.map((audience) => /* @__PURE__ */ jsxs(Card, {
					className: "flex flex-col p-6",
					"data-audience": audience.key,
					children: [
						/* @__PURE__ */ jsx("p", {
							className: "text-xs font-bold uppercase tracking-wide text-brass-600",
							children: audience.heading
						}),
						/* @__PURE__ */ jsx("h3", {
							className: "mt-2 text-xl font-bold text-ink-900",
							children: audience.title
						}),
						/* @__PURE__ */ jsx("p", {
							className: "mt-3 flex-1 text-ink-600",
							children: audience.body
						}),
						/* @__PURE__ */ jsx(ButtonLink, {
							to: audience.action.to,
							variant: "secondary",
							className: "mt-6 self-start",
							children: audience.action.label
						})
					]
				}, audience.key))
			})]
		}),
		/* @__PURE__ */ jsx("section", {
			"aria-labelledby": "measured",
			className: "border-y border-ink-200 bg-ink-50",
			children: /* @__PURE__ */ jsxs("div", {
				className: "mx-auto max-w-6xl px-4 py-14 sm:px-6",
				children: [
					/* @__PURE__ */ jsx("h2", {
						id: "measured",
						className: "text-2xl font-bold text-ink-900",
						children: "What an inspection measures"
					}),
					/* @__PURE__ */ jsx("p", {
						className: "mt-2 max-w-2xl text-ink-600",
						children: "The classic acceptance tests for centre lathes, with each result compared to a tolerance that depends on the machine's size and on the length measured over."
					}),
					/* @__PURE__ */ jsx("dl", {
						className: "mt-8 grid gap-x-8 gap-y-6 sm:grid-cols-2 lg:grid-cols-3",
						children: measured.map(([term, description]) => /* @__PURE__ */ jsxs("div", {
							className: "border-l-2 border-brass-400 pl-4",
							children: [/* @__PURE__ */ jsx("dt", {
								className: "font-bold text-ink-900",
								children: term
							}), /* @__PURE__ */ jsx("dd", {
								className: "mt-1 text-sm text-ink-600",
								children: description
							})]
						}, term))
					})
				]
			})
		}),
		/* @__PURE__ */ jsx("section", {
			className: "mx-auto max-w-6xl px-4 pt-14 sm:px-6",
			children: /* @__PURE__ */ jsxs("div", {
				className: "rounded-(--radius-panel) border border-caution/30 bg-caution-soft p-5 text-sm text-ink-800",
				children: [/* @__PURE__ */ jsx("p", {
					className: "font-bold text-caution",
					children: "Safety"
				}), /* @__PURE__ */ jsx("p", {
					className: "mt-1",
					children: "Testing a machine means working beside rotating spindles and chucks, heavy test mandrels and faceplates. Moving a machine takes qualified riggers, and connecting it a licensed electrician. Follow the machine's manual, local codes and licensed practice; guarding and safety compliance of a used machine are the buyer's and seller's responsibility under local rules."
				})]
			})
		})
	] });
});
/** A stylised extract of a scored result, to show at a glance what a report looks like. */
function SampleReading() {
	return /* @__PURE__ */ jsxs(Card, {
		className: "self-center p-5",
		"aria-label": "Example of scored readings",
		children: [/* @__PURE__ */ jsxs("div", {
			className: "flex items-baseline justify-between",
			children: [/* @__PURE__ */ jsx("p", {
				className: "text-sm font-bold text-ink-900",
				children: "Example scored readings"
			}), /* @__PURE__ */ jsx("p", {
				className: "text-xs text-ink-500",
				children: "illustration"
			})]
		}), /* @__PURE__ */ jsx("ul", {
			className: "mt-4 space-y-3",
			children: [
				{
					test: "Spindle nose run-out",
					value: "4 µm",
					tolerance: "10 µm",
					ratio: .4
				},
				{
					test: "Axial slip",
					value: "3 µm",
					tolerance: "10 µm",
					ratio: .3
				},
				{
					test: "Spindle axis, vertical",
					value: "+12 µm / 300",
					tolerance: "+20 µm",
					ratio: .6
				},
				{
					test: "Bed, vertical plane",
					value: "14 µm",
					tolerance: "20 µm",
					ratio: .7
				}
			].map((row) => /* @__PURE__ */ jsxs("li", { children: [/* @__PURE__ */ jsxs("div", {
				className: "flex justify-between text-sm",
				children: [/* @__PURE__ */ jsx("span", {
					className: "font-semibold text-ink-800",
					children: row.test
				}), /* @__PURE__ */ jsxs("span", {
					className: "tabular text-ink-600",
					children: [
						row.value,
						" ",
						/* @__PURE__ */ jsxs("span", {
							className: "text-ink-400",
							children: ["of ", row.tolerance]
						})
					]
				})]
			}), /* @__PURE__ */ jsx("div", {
				className: "mt-1.5 h-2 rounded-full bg-ink-100",
				"aria-hidden": "true",
				children: /* @__PURE__ */ jsx("div", {
					className: "h-2 rounded-full bg-within",
					style: { width: `${row.ratio * 100}%` }
				})
			})] }, row.test))
		})]
	});
}
// app/routes/how-scoring-works.tsx
var how_scoring_works_exports = /* @__PURE__ */ __exportAll({
	default: () => how_scoring_works_default,
	meta: () => meta
});
var meta = () => [{ title: "How scoring works — Tenthmark" }];
var grades = [
	["A", "Every required test within half its tolerance."],
	["B", "Every required test within its tolerance."],
	["C", "At most two tests out of tolerance, none beyond one and a half times it."],
	["D", "Anything worse."],
	["Incomplete", "A required test has no reading; no grade is given."]
];
var how_scoring_works_default = UNSAFE_withComponentProps(function HowScoringWorks() {
	return /* @__PURE__ */ jsxs("article", {
		className: "mx-auto max-w-3xl px-4 py-12 sm:px-6",
		children: [
			/* @__PURE__ */ jsx("h1", {
				className: "text-3xl font-extrabold text-ink-950",
				children: "How scoring works"
			}),
			/* @__PURE__ */ jsx("p", {
				className: "mt-4 text-lg text-ink-600",
				children: "An inspector measures the machine with dial indicators, a test mandrel and a precision level, and enters the readings. The server computes each result the way the trade does, compares it with the tolerance for that class and size of machine at the length actually measured over, and grades the whole report."
			}),
			/* @__PURE__ */ jsx("h2", {
				className: "mt-10 text-xl font-bold text-ink-900",
				children: "Results"
			}),
			/* @__PURE__ */ jsxs("ul", {
				className: "mt-3 list-disc space-y-2 pl-5 text-ink-700",
				children: [
					/* @__PURE__ */ jsx("li", { children: "Run-out and axial slip are total indicator readings: the largest reading less the smallest." }),
					/* @__PURE__ */ jsx("li", { children: "Spindle-axis parallelism is read on a test mandrel near the nose and at the measuring length, at 0° and 180°; averaging the two positions cancels the mandrel's own run-out." }),
					/* @__PURE__ */ jsx("li", { children: "Straightness is the width of the band, parallel to a reference straight line, that holds every reading (ISO 230-1's end-point, least-squares or minimum-zone line)." }),
					/* @__PURE__ */ jsx("li", { children: "A tolerance given over one length is scaled in proportion to the length measured, never below the minimum for the class." }),
					/* @__PURE__ */ jsx("li", { children: "Some tests allow a deviation one way only: a mandrel's free end may rise, never drop; a tailstock centre may sit high, never low. A reading the wrong way fails however small it is." })
				]
			}),
			/* @__PURE__ */ jsx("h2", {
				className: "mt-10 text-xl font-bold text-ink-900",
				children: "Grades"
			}),
			/* @__PURE__ */ jsx("p", {
				className: "mt-2 text-ink-600",
				children: "From the worst ratio of measured value to tolerance over the required tests. A grade is always shown with the key figures and the date; a report older than twelve months is marked as such."
			}),
			/* @__PURE__ */ jsx(Card, {
				className: "mt-4 divide-y divide-ink-100",
				children: grades.map(([grade, meaning]) => /* @__PURE__ */ jsxs("div", {
					className: "flex gap-4 px-5 py-3",
					children: [/* @__PURE__ */ jsx("span", {
						className: "w-24 shrink-0 font-extrabold text-ink-900",
						children: grade
					}), /* @__PURE__ */ jsx("span", {
						className: "text-ink-700",
						children: meaning
					})]
				}, grade))
			}),
			/* @__PURE__ */ jsxs("div", {
				className: "mt-10 rounded-(--radius-panel) border border-caution/30 bg-caution-soft p-5 text-sm text-ink-800",
				children: [/* @__PURE__ */ jsx("p", {
					className: "font-bold text-caution",
					children: "Before any test"
				}), /* @__PURE__ */ jsx("p", {
					className: "mt-1",
					children: "Take the chuck key out, keep gloves, loose sleeves and hair away from rotating parts, keep guards in place, and lock the machine out before adjusting bearings or gibs. Handle heavy mandrels and faceplates with lifting aids. The machine's manual, local rules and licensed practice come first."
				})]
			})
		]
	});
});
// app/modules/health/health.server.ts
/** Asks the database for one row, giving up after a short wait so that a health probe never hangs. */
async function checkDatabase(database, timeoutMs = 2e3) {
	let timer;
	try {
		await Promise.race([database.execute(sql`select 1`), new Promise((_, reject) => {
			timer = setTimeout(() => reject(/* @__PURE__ */ new Error(`no answer within ${timeoutMs} ms`)), timeoutMs);
		})]);
		return { ok: true };
	} catch (error) {
		return {
			ok: false,
			reason: `database unreachable: ${error instanceof Error ? error.message || error.name : String(error)}`
		};
	} finally {
		clearTimeout(timer);
	}
}
// app/routes/api.health.ts
var api_health_exports = /* @__PURE__ */ __exportAll({ loader: () => loader });
async function loader({ context }) {
	const database = await checkDatabase(context.get(databaseContext));
	if (database.ok) return Response.json({
		status: "ok",
		database: "ok"
	}, { headers: { "Cache-Control": "no-store" } });
	return Response.json({
		status: "unavailable",
		database: "unreachable",
		reason: database.reason
	}, {
		status: 503,
		headers: {
			"Cache-Control": "no-store",
			"Retry-After": "5"
		}
	});
}
// \0virtual:react-router/server-manifest
var server_manifest_default = {
	"entry": {
		"module": "/assets/entry.client-BzQPvQSk.js",
		"imports": ["/assets/jsx-runtime-vhBM3YGj.js"],
		"css": []
	},
	"routes": {
		"root": {
			"id": "root",
			"parentId": void 0,
			"path": "",
			"index": void 0,
			"caseSensitive": void 0,
			"hasAction": false,
			"hasLoader": true,
			"hasClientAction": false,
			"hasClientLoader": false,
			"hasClientMiddleware": false,
			"hasDefaultExport": true,
			"hasErrorBoundary": true,
			"module": "/assets/root-CcTzJOnP.js",
			"imports": ["/assets/jsx-runtime-vhBM3YGj.js", "/assets/ui-BcuCR8fV.js"],
			"css": ["/assets/root-3Sc8KPoB.css"],
			"clientActionModule": void 0,
			"clientLoaderModule": void 0,
			"clientMiddlewareModule": void 0,
			"hydrateFallbackModule": void 0
		},
		"routes/home": {
			"id": "routes/home",
			"parentId": "root",
			"path": void 0,
			"index": true,
			"caseSensitive": void 0,
			"hasAction": false,
			"hasLoader": false,
			"hasClientAction": false,
			"hasClientLoader": false,
			"hasClientMiddleware": false,
			"hasDefaultExport": true,
			"hasErrorBoundary": false,
			"module": "/assets/home-DsJT9A7W.js",
			"imports": ["/assets/jsx-runtime-vhBM3YGj.js", "/assets/ui-BcuCR8fV.js"],
			"css": [],
			"clientActionModule": void 0,
			"clientLoaderModule": void 0,
			"clientMiddlewareModule": void 0,
			"hydrateFallbackModule": void 0
		},
		"routes/how-scoring-works": {
			"id": "routes/how-scoring-works",
			"parentId": "root",
			"path": "how-scoring-works",
			"index": void 0,
			"caseSensitive": void 0,
			"hasAction": false,
			"hasLoader": false,
			"hasClientAction": false,
			"hasClientLoader": false,
			"hasClientMiddleware": false,
			"hasDefaultExport": true,
			"hasErrorBoundary": false,
			"module": "/assets/how-scoring-works-DbNSQwum.js",
			"imports": ["/assets/jsx-runtime-vhBM3YGj.js", "/assets/ui-BcuCR8fV.js"],
			"css": [],
			"clientActionModule": void 0,
			"clientLoaderModule": void 0,
			"clientMiddlewareModule": void 0,
			"hydrateFallbackModule": void 0
		},
		"routes/api.health": {
			"id": "routes/api.health",
			"parentId": "root",
			"path": "api/health",
			"index": void 0,
			"caseSensitive": void 0,
			"hasAction": false,
			"hasLoader": true,
			"hasClientAction": false,
			"hasClientLoader": false,
			"hasClientMiddleware": false,
			"hasDefaultExport": false,
			"hasErrorBoundary": false,
			"module": "/assets/api.health-BvRk9kiK.js",
			"imports": [],
			"css": [],
			"clientActionModule": void 0,
			"clientLoaderModule": void 0,
			"clientMiddlewareModule": void 0,
			"hydrateFallbackModule": void 0
		}
	},
	"url": "/assets/manifest-301737a9.js",
	"version": "301737a9",
	"sri": void 0
};
// \0virtual:react-router/server-build
var assetsBuildDirectory = "build-test/client";
var basename = "/";
var future = {
	"unstable_optimizeDeps": false,
	"v8_passThroughRequests": false,
	"v8_trailingSlashAwareDataRequests": false,
	"unstable_previewServerPrerendering": false,
	"v8_middleware": true,
	"v8_splitRouteModules": false,
	"v8_viteEnvironmentApi": false
};
var ssr = true;
var isSpaMode = false;
var prerender = [];
var routeDiscovery = {
	"mode": "lazy",
	"manifestPath": "/__manifest"
};
var publicPath = "/";
var entry = { module: entry_server_node_exports };
var routes = {
	"root": {
		id: "root",
		parentId: void 0,
		path: "",
		index: void 0,
		caseSensitive: void 0,
		module: root_exports
	},
	"routes/home": {
		id: "routes/home",
		parentId: "root",
		path: void 0,
		index: true,
		caseSensitive: void 0,
		module: home_exports
	},
	"routes/how-scoring-works": {
		id: "routes/how-scoring-works",
		parentId: "root",
		path: "how-scoring-works",
		index: void 0,
		caseSensitive: void 0,
		module: how_scoring_works_exports
	},
	"routes/api.health": {
		id: "routes/api.health",
		parentId: "root",
		path: "api/health",
		index: void 0,
		caseSensitive: void 0,
		module: api_health_exports
	}
};
var allowedActionOrigins = false;
export { allowedActionOrigins, server_manifest_default as assets, assetsBuildDirectory, basename, entry, future, isSpaMode, prerender, publicPath, routeDiscovery, routes, ssr };
