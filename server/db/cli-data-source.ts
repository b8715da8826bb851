// The single DataSource export the TypeORM command line expects (`npx typeorm-ts-node-esm` is not used; see DEVELOPERS.md).
import { loadConfig } from "../config/env";
import { createDataSource } from "./data-source";

export const dataSource = createDataSource(loadConfig().db);
