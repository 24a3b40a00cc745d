import { readdirSync, readFileSync, readlinkSync } from "node:fs";
import http from "node:http";
import net from "node:net";
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

/** Raw bytes to the front server; the status line answered and how long it took (the socket is closed after 20 s at most). */
function rawRequest(baseURL: string, bytes: string): Promise<{ status: number; ms: number; answer: string }> {
  const { hostname, port } = new URL(baseURL);
  return new Promise((resolve, reject) => {
    const started = Date.now();
    const socket = net.connect(Number(port), hostname);
    let answer = "";
    const done = () => {
      socket.destroy();
      resolve({ status: Number(/^HTTP\/1\.[01] (\d{3})/.exec(answer)?.[1] ?? 0), ms: Date.now() - started, answer });
    };
    socket.on("data", (d) => (answer += d));
    socket.on("end", done);
    socket.on("close", done);
    socket.on("error", reject);
    socket.setTimeout(20_000, done);
    socket.write(bytes);
  });
}

test("a GET declaring a body it never sends is a 400 at once; a short POST body a 408 within seconds, never a 502", async ({ baseURL }) => {
  const get = await rawRequest(baseURL!, "GET /api/health HTTP/1.1\r\nHost: 127.0.0.1\r\nContent-Length: 5\r\n\r\n");
  expect(get.status).toBe(400);
  expect(get.ms).toBeLessThan(2000);
  const post = await rawRequest(
    baseURL!,
    'POST /api/v1/analyses HTTP/1.1\r\nHost: 127.0.0.1\r\nContent-Type: application/json\r\nContent-Length: 50\r\n\r\n{"points":',
  );
  expect(post.status).toBe(408);
  expect(post.ms).toBeLessThan(15_000);
  // The server is unharmed.
  expect((await fetch(`${baseURL}/api/health`)).status).toBe(200);
});

test("an absolute-form request naming another host gets no redirect or link to that host", async ({ baseURL }) => {
  // RFC 9112 §3.2.2: a server must accept `GET http://host/path`; the host named there is the client's choice.
  for (const path of ["/", "/deposits", "/review", "/datasets/", "/sign-in?callbackUrl=%2Fdeposits", "/no-such-page"]) {
    const res = await rawRequest(baseURL!, `GET http://evil.example${path} HTTP/1.1\r\nHost: evil.example\r\nConnection: close\r\n\r\n`);
    expect(res.status, path).toBeGreaterThanOrEqual(200);
    expect(res.status, path).toBeLessThan(500);
    expect(res.answer, path).not.toMatch(/evil\.example/i);
  }
});

test("a server action without Origin is a 403; one nested 100 000 brackets deep is a 400, never a 500", async ({ baseURL }) => {
  const action = "Next-Action: 0123456789abcdef0123456789abcdef01234567\r\nContent-Type: text/plain;charset=UTF-8\r\nConnection: close";
  const bare = await rawRequest(baseURL!, `POST /settings HTTP/1.1\r\nHost: 127.0.0.1\r\n${action}\r\nContent-Length: 2\r\n\r\n[]`);
  expect(bare.status).toBe(403);
  const deep = "[".repeat(100_000);
  const nested = await rawRequest(
    baseURL!,
    `POST /deposits/new HTTP/1.1\r\nHost: 127.0.0.1\r\nOrigin: ${baseURL}\r\n${action}\r\nContent-Length: ${deep.length}\r\n\r\n${deep}`,
  );
  expect([400, 413]).toContain(nested.status);
  expect((await fetch(`${baseURL}/api/health`)).status).toBe(200);
});
