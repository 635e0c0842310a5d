/**
 * Types for the part of `pg` 8.x the job event listener uses (lib/jobs/listener.ts): one
 * dedicated Client that LISTENs. The project has no @types/pg; the rest of the app reaches pg
 * through Knex, which needs none. Names and behaviour follow pg's documentation.
 */
declare module 'pg' {
  interface ClientConfig {
    connectionString?: string;
    keepAlive?: boolean;
    application_name?: string;
  }

  interface QueryResult<R = Record<string, unknown>> {
    rows: R[];
    rowCount: number | null;
  }

  interface Notification {
    processId: number;
    channel: string;
    payload?: string;
  }

  class Client {
    constructor(config?: string | ClientConfig);
    connect(): Promise<void>;
    query<R = Record<string, unknown>>(text: string, values?: unknown[]): Promise<QueryResult<R>>;
    end(): Promise<void>;
    on(event: 'notification', listener: (message: Notification) => void): this;
    on(event: 'error', listener: (err: Error) => void): this;
    on(event: 'end', listener: () => void): this;
    removeAllListeners(event?: string): this;
  }

  const pg: { Client: typeof Client };
  export { Client, type ClientConfig, type Notification, type QueryResult };
  export default pg;
}
