import { httpError } from "~/utils/http";

export async function loader() {
  throw httpError("not_found", "There is no page at this address.");
}

export default function NotFound() {
  return null;
}
