// Serves the built app: static assets with long caching, everything else through React Router.
// It overwrites x-thermotally-client with the socket's address (never trusting a client-sent value),
// so sign-in attempts can be limited per client address. TRUST_PROXY=1 takes the left-most
// X-Forwarded-For entry instead, for deployments behind a reverse proxy.
import compression from "compression";
import express from "express";
import { createRequestHandler } from "@react-router/express";

import path from "node:path";
import { pathToFileURL } from "node:url";

const buildDir = path.resolve(process.env.BUILD_DIR ?? "build");
const build = await import(pathToFileURL(path.join(buildDir, "server/index.js")).href);
const app = express();
app.disable("x-powered-by");
app.use(compression());
app.use("/assets", express.static(path.join(buildDir, "client/assets"), { immutable: true, maxAge: "1y" }));
app.use(express.static(path.join(buildDir, "client"), { maxAge: "1h" }));
app.use((req, _res, next) => {
  const forwarded = process.env.TRUST_PROXY === "1" ? String(req.headers["x-forwarded-for"] ?? "").split(",")[0].trim() : "";
  req.headers["x-thermotally-client"] = forwarded || req.socket.remoteAddress || "unknown";
  next();
});
app.all("*", createRequestHandler({ build, mode: process.env.NODE_ENV }));

const port = Number(process.env.PORT ?? 3000);
const host = process.env.HOST ?? "127.0.0.1";
app.listen(port, host, () => console.log(`Thermotally listening on http://${host === "127.0.0.1" ? "localhost" : host}:${port}`));
