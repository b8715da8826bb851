/** Health and the local mail stand-in's outbox: the data side of server/routes/system.routes.ts. */
import type { AppContext } from "../context";
import { OutboxMessage } from "../entities";

/** True when the database answers a trivial query within `ms` (false on an error or a time-out; never throws). */
export function databaseAnswers(ctx: AppContext, ms = 2000): Promise<boolean> {
  const timeout = new Promise<boolean>((resolve) => setTimeout(() => resolve(false), ms).unref());
  return Promise.race([ctx.dataSource.query("SELECT 1").then(() => true, () => false), timeout]);
}

/** The newest 200 messages the stand-in received. */
export function latestOutbox(ctx: AppContext): Promise<OutboxMessage[]> {
  return ctx.dataSource.getRepository(OutboxMessage).find({ order: { receivedAt: "DESC" }, take: 200 });
}
