# Residuum service image: a static binary on a small base, run as a non-root user.
#   docker build -t residuum .
#   docker compose up            (with PostgreSQL; see docker-compose.yml)

FROM golang:1.26.8-bookworm AS build
WORKDIR /src
# Module downloads first, so that editing the code does not refetch them.
COPY go.mod go.sum ./
RUN go mod download
COPY . .
# CGO off: the SQLite driver is pure Go, so the binary is fully static.
RUN CGO_ENABLED=0 GOOS=linux go build -trimpath -ldflags="-s -w" -o /out/residuum ./cmd/residuum

FROM alpine:3.22
# wget (busybox) serves the container health check; tzdata and certificates
# for a PostgreSQL server reached over TLS.
RUN apk add --no-cache ca-certificates tzdata \
 && addgroup -S -g 10001 residuum \
 && adduser -S -D -H -u 10001 -G residuum residuum \
 && mkdir -p /data && chown residuum:residuum /data
COPY --from=build /out/residuum /usr/local/bin/residuum
USER 10001:10001
WORKDIR /data
# Inside a container the service must listen on all interfaces; -public
# acknowledges that it has no accounts yet (put it behind a proxy that does).
ENV RESIDUUM_ADDR=0.0.0.0:8080 \
    RESIDUUM_PUBLIC=true \
    RESIDUUM_DATA=/data
EXPOSE 8080
VOLUME ["/data"]
HEALTHCHECK --interval=10s --timeout=3s --start-period=20s --retries=3 \
  CMD wget -q -O /dev/null http://127.0.0.1:8080/readyz || exit 1
ENTRYPOINT ["/usr/local/bin/residuum"]
CMD ["serve"]
