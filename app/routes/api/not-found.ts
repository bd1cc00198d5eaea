import { httpError } from "~/utils/http";

export async function loader() {
  return httpError(404, "No such API endpoint. See /api for the list.");
}

export async function action() {
  return httpError(404, "No such API endpoint. See /api for the list.");
}
