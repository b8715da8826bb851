import "./lib/zod-config";
import { StrictMode } from "react";
import { createRoot } from "react-dom/client";
import "@fontsource/inter/latin-400.css";
import "@fontsource/inter/latin-600.css";
import "@fontsource/jetbrains-mono/latin-400.css";
import "@fontsource/jetbrains-mono/latin-700.css";
import "./index.css";
import { App } from "@/app";

const root = document.getElementById("root");
if (!root) throw new Error("Lotwise needs a <div id=\"root\"> in index.html");

createRoot(root).render(
  <StrictMode>
    <App />
  </StrictMode>,
);
