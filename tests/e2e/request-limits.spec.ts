import { readdirSync, readFileSync, readlinkSync } from "node:fs";
import http from "node:http";
import { expect, test } from "@playwright/test";

// A chunked upload without Content-Length against the real server: it must answer 413 long
// before the 200 MB are sent, and its memory must not grow with what the client keeps sending.

const MB = 1024 * 1024;

/** The pid of the process listening on `port` (Linux /proc), or null when it cannot be seen. */
function listenerPid(port: number): number | null {
  try {
    const hexPort = port.toString(16).toUpperCase().padStart(4, "0");
    const inodes = new Set<string>();
    for (const table of ["/proc/net/tcp", "/proc/net/tcp6"]) {
      for (const line of readFileSync(table, "utf8").split("\n").slice(1)) {
        const cols = line.trim().split(/\s+/);
        // local_address is HEX_IP:HEX_PORT; state 0A is LISTEN.
        if (cols[1]?.endsWith(`:${hexPort}`) && cols[3] === "0A") inodes.add(cols[9]);
      }
    }
    for (const pid of readdirSync("/proc").filter((d) => /^\d+$/.test(d))) {
      let fds: string[];
      try {
        fds = readdirSync(`/proc/${pid}/fd`);
      } catch {
        continue;
      }
      for (const fd of fds) {
        try {
          const m = /^socket:\[(\d+)\]$/.exec(readlinkSync(`/proc/${pid}/fd/${fd}`));
          if (m && inodes.has(m[1])) return Number(pid);
        } catch {
          // the descriptor closed while we looked
        }
      }
    }
  } catch {
    // not Linux, or /proc hidden
  }
  return null;
}

const rssBytes = (pid: number) => Number(/VmRSS:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, "utf8"))![1]) * 1024;

/** Sends up to `total` bytes chunked (no Content-Length), stopping as soon as the server answers. */
function chunkedPost(url: URL, total: number): Promise<{ status: number; body: string; sent: number }> {
  return new Promise((resolve, reject) => {
    let sent = 0;
    let answered = false;
    const chunk = Buffer.alloc(64 * 1024, 0x20);
    const req = http.request(
      url,
      { method: "POST", headers: { "content-type": "application/json", "transfer-encoding": "chunked" } },
      (res) => {
        answered = true;
        let body = "";
        res.setEncoding("utf8");
        res.on("data", (d) => (body += d));
        res.on("end", () => {
          req.destroy();
          resolve({ status: res.statusCode ?? 0, body, sent });
        });
      },
    );
    req.on("error", (err) => (answered ? undefined : reject(err)));
    const write = () => {
      while (!answered && sent < total) {
        sent += chunk.length;
        if (!req.write(chunk)) return void req.once("drain", write);
      }
      if (!answered) req.end();
    };
    write();
  });
}

test("a chunked 200 MB analysis request is refused with 413 after a little over 12 MB, without the server's memory growing", async ({
  baseURL,
}) => {
  const url = new URL("/api/v1/analyses", baseURL);
  const pid = listenerPid(Number(url.port));
  const before = pid ? rssBytes(pid) : 0;

  const res = await chunkedPost(url, 200 * MB);

  expect(res.status).toBe(413);
  const problem = JSON.parse(res.body);
  expect(problem.code).toBe("payload_too_large");
  expect(problem.title).toMatch(/larger than 12 MB, the limit/);
  // The answer came while most of the 200 MB were still unsent (socket buffers hold a few MB).
  expect(res.sent).toBeLessThan(100 * MB);
  if (pid) {
    const grown = rssBytes(pid) - before;
    console.log(
      `server pid ${pid}: RSS grew by ${(grown / MB).toFixed(1)} MB; client sent ${(res.sent / MB).toFixed(1)} MB before the answer`,
    );
    expect(grown).toBeLessThan(100 * MB);
  }
});
