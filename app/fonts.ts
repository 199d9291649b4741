import localFont from "next/font/local";

// The same TTF files the PDF renderer embeds, so pages and cards share one face.
export const plexSans = localFont({
  src: [
    { path: "../fonts/IBMPlexSans_400Regular.ttf", weight: "400", style: "normal" },
    { path: "../fonts/IBMPlexSans_400Regular_Italic.ttf", weight: "400", style: "italic" },
    { path: "../fonts/IBMPlexSans_600SemiBold.ttf", weight: "600", style: "normal" },
    { path: "../fonts/IBMPlexSans_700Bold.ttf", weight: "700", style: "normal" },
  ],
  variable: "--font-plex-sans",
  display: "swap",
});

export const plexMono = localFont({
  src: [{ path: "../fonts/IBMPlexMono_500Medium.ttf", weight: "500", style: "normal" }],
  variable: "--font-plex-mono",
  display: "swap",
});
