import { httpError } from "~/utils/permissions.server";

export async function loader() {
  return httpError(404, "No such API endpoint. See /api for the list.");
}

export async function action() {
  return httpError(404, "No such API endpoint. See /api for the list.");
}
