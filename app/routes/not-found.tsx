// Any address no other route claims: a friendly 404 rendered by the root error boundary.
export function loader() {
  throw new Response("Not found", { status: 404, statusText: "Not Found" });
}

export default function NotFound() {
  return null;
}
