# Build: docker build -t lagwright .   Run with a PostgreSQL: see docker-compose.yml.
FROM golang:1.26 AS build
WORKDIR /src
COPY go.mod go.sum ./
RUN go mod download
COPY . .
RUN CGO_ENABLED=0 go build -trimpath -buildvcs=false -o /out/lagwright ./cmd/lagwright

FROM debian:bookworm-slim
RUN apt-get update && apt-get install -y --no-install-recommends ca-certificates \
    && rm -rf /var/lib/apt/lists/* \
    && useradd --system --uid 10001 --home-dir /var/lib/lagwright --create-home lagwright
COPY --from=build /out/lagwright /usr/local/bin/lagwright
USER lagwright
WORKDIR /var/lib/lagwright
ENV LAGWRIGHT_ADDR=0.0.0.0:8080 LAGWRIGHT_DATA=/var/lib/lagwright
EXPOSE 8080
# The image has no PostgreSQL of its own: give it DATABASE_URL.
ENTRYPOINT ["lagwright"]
CMD ["serve"]
