/**
 * Real engines for the warehouse tests: two ClickHouse servers (Debian's clickhouse-server) on
 * free loopback ports with a Distributed table's cluster over both, and one PostgreSQL 15
 * (Debian's postgresql-15, initdb in a temp folder). Each server has its own temp folder; stop()
 * ends it by its own pid (pg_ctl stop reads the pid file of its own data folder) and removes
 * the folder. Every wait is bounded.
 */
import { execFileSync, spawn, type ChildProcess } from "node:child_process";
import fs from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";

const CLICKHOUSE_SERVER = ["/usr/sbin/clickhouse-server", "/usr/bin/clickhouse-server"];
const CLICKHOUSE_CLIENT = ["/usr/bin/clickhouse-client"];
const PG_BIN = "/usr/lib/postgresql/15/bin";

const firstExisting = (paths: readonly string[]): string | undefined => paths.find((p) => fs.existsSync(p));

/** Why an engine cannot run here (null = it can). */
export function clickhouseMissing(): string | null {
  if (!firstExisting(CLICKHOUSE_SERVER)) return "clickhouse-server is not installed (apt-get install clickhouse-server)";
  if (!firstExisting(CLICKHOUSE_CLIENT)) return "clickhouse-client is not installed (apt-get install clickhouse-client)";
  return null;
}
export function postgresMissing(): string | null {
  if (!fs.existsSync(path.join(PG_BIN, "initdb"))) return `PostgreSQL 15 is not installed (${PG_BIN}/initdb; apt-get install postgresql-15)`;
  if (process.getuid?.() === 0) {
    try { execFileSync("id", ["-u", "postgres"], { stdio: "ignore" }); } catch { return "running as root and there is no 'postgres' user to run initdb"; }
  }
  return null;
}

/** A free loopback TCP port (asked of the OS, then released). */
export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = net.createServer();
    s.once("error", reject);
    s.listen(0, "127.0.0.1", () => {
      const port = (s.address() as net.AddressInfo).port;
      s.close(() => resolve(port));
    });
  });
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function waitFor(what: string, ok: () => boolean, seconds: number): Promise<void> {
  const until = Date.now() + seconds * 1000;
  while (Date.now() < until) {
    if (ok()) return;
    await sleep(250);
  }
  throw new Error(`${what} did not come up within ${seconds} s`);
}

export interface ClickHouseServer { port: number; pid: number; dir: string; query(sql: string, input?: string): string }

function clickhouseConfig(dir: string, ports: { tcp: number; http: number; inter: number }, shards: readonly number[]): string {
  const shardXml = shards.map((p) => `<shard><replica><host>127.0.0.1</host><port>${p}</port></replica></shard>`).join("");
  return `<?xml version="1.0"?>
<yandex>
  <logger><level>warning</level><log>${dir}/server.log</log><errorlog>${dir}/server.err.log</errorlog></logger>
  <listen_host>127.0.0.1</listen_host>
  <tcp_port>${ports.tcp}</tcp_port><http_port>${ports.http}</http_port><interserver_http_port>${ports.inter}</interserver_http_port>
  <path>${dir}/data/</path><tmp_path>${dir}/tmp/</tmp_path><format_schema_path>${dir}/format_schemas/</format_schema_path>
  <users_config>${dir}/users.xml</users_config>
  <default_profile>default</default_profile><default_database>default</default_database>
  <mark_cache_size>5368709120</mark_cache_size>
  <remote_servers><tailsift_test>${shardXml}</tailsift_test></remote_servers>
</yandex>
`;
}

const USERS_XML = `<?xml version="1.0"?>
<yandex>
  <profiles><default></default></profiles>
  <users><default><password></password><networks><ip>127.0.0.1</ip><ip>::1</ip></networks><profile>default</profile><quota>default</quota></default></users>
  <quotas><default></default></quotas>
</yandex>
`;

function clickhouseClient(port: number) {
  const client = firstExisting(CLICKHOUSE_CLIENT)!;
  return (sql: string, input?: string): string =>
    execFileSync(client, ["--host", "127.0.0.1", "--port", String(port), "--multiquery", "--query", sql], {
      input: input ?? "", encoding: "utf8", timeout: 120_000, maxBuffer: 1 << 28, stdio: ["pipe", "pipe", "pipe"],
    });
}

/** Starts `count` ClickHouse servers; each knows the cluster `tailsift_test` of all of them. */
export async function startClickHouse(count: number, started: (s: { stop(): Promise<void> }) => void): Promise<ClickHouseServer[]> {
  const bin = firstExisting(CLICKHOUSE_SERVER)!;
  const ports = [];
  for (let i = 0; i < count; i++) ports.push({ tcp: await freePort(), http: await freePort(), inter: await freePort() });
  const servers: ClickHouseServer[] = [];
  for (const p of ports) {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "tailsift-ch-"));
    fs.writeFileSync(path.join(dir, "config.xml"), clickhouseConfig(dir, p, ports.map((q) => q.tcp)));
    fs.writeFileSync(path.join(dir, "users.xml"), USERS_XML);
    const child: ChildProcess = spawn(bin, [`--config-file=${dir}/config.xml`], { cwd: dir, stdio: "ignore" });
    const pid = child.pid ?? -1;
    started({ stop: () => stopChild(child, dir) });
    const query = clickhouseClient(p.tcp);
    await waitFor(`clickhouse-server on port ${p.tcp}`, () => {
      if (child.exitCode !== null) throw new Error(`clickhouse-server exited (${child.exitCode}); see ${dir}/server.err.log`);
      try { return query("SELECT 1").trim() === "1"; } catch { return false; }
    }, 60);
    servers.push({ port: p.tcp, pid, dir, query });
  }
  return servers;
}

async function stopChild(child: ChildProcess, dir: string): Promise<void> {
  if (child.exitCode === null && child.signalCode === null && child.pid !== undefined) {
    const exited = new Promise<void>((r) => child.once("exit", () => r()));
    child.kill("SIGTERM");
    const done = await Promise.race([exited.then(() => true), sleep(20_000).then(() => false)]);
    if (!done) { child.kill("SIGKILL"); await Promise.race([exited, sleep(5_000)]); }
  }
  fs.rmSync(dir, { recursive: true, force: true });
}

export interface PostgresServer { port: number; dir: string; query(sql: string, input?: string): string; stop(): Promise<void> }

/** initdb in a temp folder (as the postgres user when run as root) and pg_ctl start on a free port. */
export async function startPostgres(started: (s: { stop(): Promise<void> }) => void): Promise<PostgresServer> {
  const root = process.getuid?.() === 0;
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "tailsift-pg-"));
  const data = path.join(dir, "data");
  const port = await freePort();
  const asOwner = (cmd: string, args: string[]) =>
    root ? execFileSync("runuser", ["-u", "postgres", "--", cmd, ...args], { encoding: "utf8", timeout: 120_000 })
      : execFileSync(cmd, args, { encoding: "utf8", timeout: 120_000 });
  if (root) {
    const uid = Number(execFileSync("id", ["-u", "postgres"], { encoding: "utf8" }).trim());
    const gid = Number(execFileSync("id", ["-g", "postgres"], { encoding: "utf8" }).trim());
    fs.chownSync(dir, uid, gid);
  }
  let running = false;
  const stop = async () => {
    if (running) {
      try { asOwner(path.join(PG_BIN, "pg_ctl"), ["-D", data, "-m", "fast", "-w", "-t", "30", "stop"]); } catch { /* already gone */ }
      running = false;
    }
    fs.rmSync(dir, { recursive: true, force: true });
  };
  started({ stop });
  asOwner(path.join(PG_BIN, "initdb"), ["-D", data, "-A", "trust", "-U", "postgres", "-E", "UTF8", "--locale=C"]);
  running = true;
  asOwner(path.join(PG_BIN, "pg_ctl"), ["-D", data, "-l", path.join(dir, "server.log"), "-w", "-t", "60",
    "-o", `-p ${port} -k ${dir} -c listen_addresses=127.0.0.1 -c fsync=off`, "start"]);
  const query = (sql: string, input?: string): string =>
    execFileSync(path.join(PG_BIN, "psql"), ["-h", "127.0.0.1", "-p", String(port), "-U", "postgres", "-X", "-q", "-A", "-t", "-v", "ON_ERROR_STOP=1", "-c", sql], {
      input: input ?? "", encoding: "utf8", timeout: 120_000, maxBuffer: 1 << 28, stdio: ["pipe", "pipe", "pipe"],
    });
  return { port, dir, query, stop };
}
