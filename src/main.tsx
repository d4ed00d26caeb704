import { StrictMode } from "react";
import { createRoot } from "react-dom/client";
// The fonts ship with the app (no third-party font host); only the weights in use.
import "@fontsource/ibm-plex-sans/400.css";
import "@fontsource/ibm-plex-sans/500.css";
import "@fontsource/ibm-plex-sans/600.css";
import "@fontsource/ibm-plex-mono/400.css";
import "@fontsource/ibm-plex-mono/500.css";
import "./styles.css";
import { AppProviders } from "./app/providers";

const rootElement = document.getElementById("root");
if (!rootElement) throw new Error('index.html must contain <div id="root">');

createRoot(rootElement).render(
  <StrictMode>
    <AppProviders />
  </StrictMode>,
);
