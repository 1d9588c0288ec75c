import knex from 'knex';
const k = knex({ client: 'pg', connection: process.env.DATABASE_URL });
const q = k.raw('SELECT code FROM materials WHERE code = ANY(?::text[])', [['A', 'B,"x', "it's"]]);
console.log(q.toSQL().sql, q.toSQL().bindings);
console.log((await q).rows.length);
await k.destroy();
