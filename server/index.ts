import type { Server } from "node:http";
import { createApp } from "./app";
import { loadConfig, type ServerConfig } from "./config/env";
import type { AppContext } from "./context";
import { createContext } from "./create-context";

/** Starts the API and client server; resolves once it listens. */
export async function startServer(config: ServerConfig): Promise<{ server: Server; ctx: AppContext; close(): Promise<void> }> {
  const ctx = await createContext(config);
  const { app } = createApp(ctx);
  const server = await new Promise<Server>((resolve, reject) => {
    const s = app.listen(config.port, config.host, () => resolve(s));
    s.once("error", reject);
  });
  ctx.log.info("server_listening", { url: `http://${config.host}:${config.port}`, mail: ctx.mailer.mode });
  return {
    server,
    ctx,
    async close() {
      await new Promise<void>((resolve) => server.close(() => resolve()));
      server.closeAllConnections();
      await ctx.close();
    },
  };
}

// `tsx server/index.ts` (the dev watcher) runs the server on its own.
if (import.meta.url === `file://${process.argv[1]}`) {
  const running = await startServer(loadConfig()).catch((error: Error) => {
    process.stderr.write(`${error.message}\n`);
    process.exit(1);
  });
  const stop = () => void running.close().then(() => process.exit(0));
  process.once("SIGINT", stop);
  process.once("SIGTERM", stop);
}
