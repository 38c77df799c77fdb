import type { Config } from "@react-router/dev/config";

export default {
  ssr: true,
  // BUILD_DIR lets several builds (a test run beside a running demo) live side by side.
  buildDirectory: process.env.BUILD_DIR ?? "build",
  future: {
    v8_middleware: true,
    v8_splitRouteModules: true,
    v8_viteEnvironmentApi: true,
    v8_passThroughRequests: true,
    v8_trailingSlashAwareDataRequests: true,
  },
} satisfies Config;
