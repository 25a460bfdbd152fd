import pg from "pg";

// One pool per process, as any React Router app on PostgreSQL would have: plain `pg`, no ORM.
export const pool = new pg.Pool({ connectionString: process.env.DATABASE_URL, max: 10 });
