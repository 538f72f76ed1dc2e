import pg from 'pg';

// BIGINT counts (count(*)) and NUMERIC come back as strings by default; the
// values we store are well inside double precision.
pg.types.setTypeParser(pg.types.builtins.INT8, (v) => Number(v));
pg.types.setTypeParser(pg.types.builtins.NUMERIC, (v) => Number(v));
