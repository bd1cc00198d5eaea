import { httpError } from "~/utils/http";

export async function loader() {
  return httpError("not_found", "No such API endpoint. See /api for the list.");
}

export async function action() {
  return httpError("not_found", "No such API endpoint. See /api for the list.");
}
