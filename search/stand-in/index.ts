// The local stand-in for the hosted search engine; see search/README.md for what it speaks.
export { startSearchStandIn, DEFAULT_SEARCH_MASTER_KEY, type SearchStandIn, type SearchStandInOptions } from "./server.ts";
