# syntax=docker/dockerfile:1
# Build with the dev tool chain, run with production dependencies only. The RUN steps are the same
# commands as README's and CI's: `npm ci`, `npm run build`, `npm ci --omit=dev`; CMD is `npm start`'s server.
FROM node:22-slim AS build
WORKDIR /app
COPY package.json package-lock.json ./
# a dev dependency of the tests (the OpenAPI type generator with its own TypeScript 5), installed from the tree
COPY tools/openapi-types/package.json ./tools/openapi-types/
RUN npm ci --no-audit --no-fund
COPY . .
RUN npm run build

FROM node:22-slim AS deps
WORKDIR /app
COPY package.json package-lock.json ./
COPY tools/openapi-types/package.json ./tools/openapi-types/
RUN npm ci --omit=dev --no-audit --no-fund

FROM node:22-slim
# V8's semi-spaces of 4 MB in every isolate (the server's and its compute threads'; V8's default 16):
# the soak's memory in the pod's limit, at no measured cost to the rates (docs/performance.md, "Soak memory")
# the verdict records' buildVersion suffix (docker build --build-arg BACKSTOP_BUILD_ID=$(git rev-parse --short HEAD))
ARG BACKSTOP_BUILD_ID=
ENV NODE_ENV=production PORT=8080 NODE_OPTIONS="--max-semi-space-size=4" BACKSTOP_BUILD_ID=$BACKSTOP_BUILD_ID
WORKDIR /app
COPY --from=deps /app/node_modules ./node_modules
COPY --from=build /app/dist ./dist
COPY package.json ./
COPY examples ./examples
COPY bin ./bin
USER node
EXPOSE 8080
# no shell tools needed: node itself fetches /livez
HEALTHCHECK --interval=10s --timeout=3s --start-period=5s --retries=3 CMD ["node", "-e", "fetch('http://127.0.0.1:'+(process.env.PORT||8080)+'/livez').then(r=>process.exit(r.ok?0:1),()=>process.exit(1))"]
# node is PID 1: the server handles SIGTERM/SIGINT itself (drain, then exit 0). One HTTP process a
# container, with its compute threads (BACKSTOP_WORKERS, by default one per CPU of the container's
# quota, at most 4); scale with replicas
CMD ["node", "dist/bundle/main.js"]
