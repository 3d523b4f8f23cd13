export const THEME_STORAGE_KEY = "peeksafe-theme";

// Runs before the first paint so a dark-mode reader never sees a white flash.
const script = `(function(){try{var t=localStorage.getItem("${THEME_STORAGE_KEY}");var d=t?t==="dark":window.matchMedia("(prefers-color-scheme: dark)").matches;document.documentElement.classList.toggle("dark",d);}catch(e){}})();`;

/** The inline no-flash theme script; render it inside <head> of the root layout. */
export function ThemeScript() {
  return <script dangerouslySetInnerHTML={{ __html: script }} />;
}
