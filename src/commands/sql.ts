/**
 * commands/sql: `tailsift sql` — the level-aggregation query (portableSql/levelSql) and the
 * scoring query (portableSql/scoringSql) for engines other than DuckDB. The SQL is built in
 * src/portableSql/; this module only re-exports what the CLI and the library use.
 */
export { levelSql, qualifiedName, targetExpr, type LevelSqlOptions } from "../portableSql/levelSql.js";
