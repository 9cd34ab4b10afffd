# Build with the dev tool chain, run with production dependencies only (the same commands as README:
# `npm ci`, `npm run build`, then the server that `npm start` runs).
FROM node:22-slim AS build
WORKDIR /app
COPY package.json package-lock.json ./
RUN npm ci --no-audit --no-fund
COPY . .
RUN npm run build

FROM node:22-slim
ENV NODE_ENV=production PORT=8080
WORKDIR /app
COPY package.json package-lock.json ./
RUN npm ci --omit=dev --no-audit --no-fund && npm cache clean --force
COPY --from=build /app/dist ./dist
COPY examples ./examples
COPY bin ./bin
USER node
EXPOSE 8080
CMD ["node", "dist/adapters/http/main.js"]
