// The name this process goes by among the instances and workers sharing one database: the host,
// the process id and a random suffix (a restarted process on the same host may get the same pid).
import { randomBytes } from "node:crypto";
import { hostname } from "node:os";

export const instanceId: string = `${hostname()}-${process.pid}-${randomBytes(3).toString("hex")}`;
