import { data } from "react-router";

// Unknown addresses inside the app get a real 404, shown by the root error boundary.
export function loader() {
  throw data("Not found", { status: 404 });
}

export function action() {
  throw data("Not found", { status: 404 });
}

export default function NotFound() {
  return null;
}
