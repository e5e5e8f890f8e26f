import type { Metadata } from "next";
import type { ReactNode } from "react";
import "./globals.css";
import { inter, plexMono } from "./fonts";
import { Providers } from "./providers";

export const metadata: Metadata = {
  title: { default: "Loopwright", template: "%s · Loopwright" },
  description: "Checked, approved and signed op-amp design calculations for analog design teams.",
  icons: { icon: "/mark.svg" },
};

export default function RootLayout({ children }: { children: ReactNode }) {
  return (
    <html lang="en" className={`${inter.variable} ${plexMono.variable}`}>
      <body className="font-sans antialiased">
        <Providers>{children}</Providers>
      </body>
    </html>
  );
}
