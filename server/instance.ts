// The name of this process among every Mechweave process on one database: app instances and job
// workers alike. It tells apart who leads a room, who ran a job, and which instance answered
// /healthz. Host and pid let an operator find the process; the random part keeps a restarted
// process with a recycled pid from passing for its predecessor.
import { randomBytes } from "node:crypto";
import { hostname } from "node:os";

export const instanceId = `${hostname()}-${process.pid}-${randomBytes(3).toString("hex")}`;
