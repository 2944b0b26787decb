# The API image: Node 20 on Debian with Debian's Chromium for PDF reports (no browser download).
# It runs as an unprivileged user (uid 10001), so Chromium can keep its sandbox where the kernel allows it
# (LEADLINE_CHROMIUM_SANDBOX=auto falls back to an unsandboxed Chromium only where the seccomp profile or the kernel
# refuses the sandbox; true refuses to run without it).
FROM node:20-bookworm-slim
RUN apt-get update && apt-get install -y --no-install-recommends chromium fonts-dejavu-core fonts-liberation2 \
  && rm -rf /var/lib/apt/lists/* \
  && groupadd --system --gid 10001 leadline \
  && useradd --system --uid 10001 --gid leadline --home-dir /home/leadline --create-home --shell /usr/sbin/nologin leadline
WORKDIR /app
COPY package.json package-lock.json ./
RUN npm ci --no-audit --no-fund
COPY . .
RUN npm run build && npm prune --omit=dev \
  && mkdir -p /var/lib/leadline /app/data && chown leadline:leadline /var/lib/leadline /app/data
ENV NODE_ENV=production
# The application files stay owned by root (read-only to the service); only the data folders are its own.
USER leadline:leadline
CMD ["node", "dist/apps/api/src/main.js"]
