import type { MouseEvent } from "react";
import { useNavigate } from "react-router";

/**
 * Long lists render their links as plain anchors: a router Link costs the server render several
 * hooks each, and a page of a hundred rows feels it. One click handler on the list sends a plain
 * left click on a same-origin anchor through the router instead, as a Link would; modified clicks,
 * other targets and downloads keep the browser's own behaviour. `afterwards` runs after a routed click.
 */
export function useRouterClicks(afterwards?: () => void) {
  const navigate = useNavigate();
  return (event: MouseEvent) => {
    const anchor = (event.target as Element).closest("a");
    if (!anchor || event.defaultPrevented || event.button !== 0 || event.metaKey || event.ctrlKey || event.shiftKey || event.altKey) return;
    if (anchor.origin !== window.location.origin || (anchor.target && anchor.target !== "_self") || anchor.hasAttribute("download")) return;
    event.preventDefault();
    void navigate(anchor.pathname + anchor.search + anchor.hash);
    afterwards?.();
  };
}
