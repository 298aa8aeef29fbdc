import localFont from "next/font/local";

// Shipped with the app (fonts/), never fetched at build time.
export const figtree = localFont({
  src: "../fonts/Figtree-Variable.woff2",
  variable: "--font-figtree",
  weight: "300 900",
  display: "swap",
});
