import { reactRouter } from "@react-router/dev/vite";
import tailwindcss from "@tailwindcss/vite";
import { defineConfig } from "vite";

export default defineConfig({
  plugins: [tailwindcss(), reactRouter()],
  resolve: { tsconfigPaths: true },
  // convert-units (used by the engine's unit helpers, which also run in the browser) refers to Node's `global`.
  define: { global: "globalThis" },
  ssr: { external: ["sequelize", "mariadb", "exceljs", "openchemlib", "smtp-server", "s3rver", "@aws-sdk/client-s3", "nodemailer", "bcryptjs"] },
});
