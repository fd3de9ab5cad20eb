# Builds the shiftrank binary and runs `shiftrank serve`. Used by
# docker-compose.yml; see README.md for the deployment steps.
FROM golang:1.26-bookworm AS build
WORKDIR /src
COPY go.mod go.sum ./
RUN go mod download
COPY . .
RUN CGO_ENABLED=0 go build -trimpath -ldflags="-s -w" -o /out/shiftrank ./cmd/shiftrank

FROM alpine:3.21
# wget (busybox) serves the health check; ca-certificates lets callbacks
# reach https receivers.
RUN apk add --no-cache ca-certificates && adduser -D -H -u 10001 shiftrank
COPY --from=build /out/shiftrank /usr/local/bin/shiftrank
USER shiftrank
# Inside the container the service listens on every interface, so it
# requires API keys (shiftrank apikey create --name NAME).
ENV SHIFTRANK_ADDR=0.0.0.0:8080
EXPOSE 8080
HEALTHCHECK --interval=10s --timeout=3s --start-period=20s --retries=3 \
  CMD wget -q -O /dev/null http://127.0.0.1:8080/readyz || exit 1
ENTRYPOINT ["shiftrank"]
CMD ["serve"]
