// Entry point: reads settings from the environment and starts the unit server.
import { startServer } from './start-server.ts';

await startServer(process.env);
