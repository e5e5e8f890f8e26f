import localFont from "next/font/local";

// Fonts ship with the app (public/fonts, SIL Open Font License); nothing is downloaded.
export const inter = localFont({
  src: [
    { path: "../public/fonts/Inter_400Regular.ttf", weight: "400", style: "normal" },
    { path: "../public/fonts/Inter_400Regular_Italic.ttf", weight: "400", style: "italic" },
    { path: "../public/fonts/Inter_500Medium.ttf", weight: "500", style: "normal" },
    { path: "../public/fonts/Inter_600SemiBold.ttf", weight: "600", style: "normal" },
    { path: "../public/fonts/Inter_700Bold.ttf", weight: "700", style: "normal" },
  ],
  variable: "--font-inter",
  display: "swap",
});

export const plexMono = localFont({
  src: [
    { path: "../public/fonts/IBMPlexMono_400Regular.ttf", weight: "400", style: "normal" },
    { path: "../public/fonts/IBMPlexMono_500Medium.ttf", weight: "500", style: "normal" },
  ],
  variable: "--font-plex-mono",
  display: "swap",
});
