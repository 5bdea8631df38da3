// A listing's states as sellers and staff see them. Apart from ./catalogue, which buyers' pages load,
// since only the seller's pages show them. Pure: shared by the server and the browser.

export const listingStatuses = [
  { value: "draft", label: "Draft" },
  { value: "published", label: "Published" },
  { value: "sold", label: "Sold" },
  { value: "withdrawn", label: "Withdrawn" },
] as const;
export type ListingStatus = (typeof listingStatuses)[number]["value"];
