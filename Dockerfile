# syntax=docker/dockerfile:1
# Build: compile TypeScript to dist/. Run: node on dist/ with production dependencies only.
FROM node:20-bookworm-slim AS build
WORKDIR /app
COPY package.json package-lock.json ./
RUN npm ci --no-audit --no-fund
COPY tsconfig.json tsconfig.build.json ./
COPY src ./src
RUN npm run build

FROM node:20-bookworm-slim AS runtime
ENV NODE_ENV=production \
    HOST=0.0.0.0 \
    PORT=8080 \
    DATA_DIR=/data
WORKDIR /app
COPY package.json package-lock.json ./
RUN npm ci --omit=dev --no-audit --no-fund && npm cache clean --force
COPY --from=build /app/dist ./dist
# The dashboard page: static files served as they are (routes/page.ts), no build step.
COPY web ./web
RUN mkdir -p /data && chown node:node /data
USER node
VOLUME ["/data"]
EXPOSE 8080
HEALTHCHECK --interval=15s --timeout=3s --start-period=10s \
  CMD node -e "fetch('http://127.0.0.1:'+(process.env.PORT||8080)+'/healthz').then(r=>process.exit(r.ok?0:1),()=>process.exit(1))"
# `serve` by default; the compose file runs `worker` from the same image. Bound to 0.0.0.0, the API
# refuses to start without API_KEYS (or an explicit ALLOW_OPEN_MODE=true).
ENTRYPOINT ["node", "dist/cli/main.js"]
CMD ["serve"]
