export async function loader() {
  throw Response.json({ error: "There is no page at this address." }, { status: 404 });
}

export default function NotFound() {
  return null;
}
