// Metro for `npm run dev:web`: Expo's defaults, plus a proxy of /api to the API server so the app in the dev server
// talks to the API on the same origin (no CORS). API_PROXY_TARGET: where the API runs (default http://127.0.0.1:8080).
// The exported build (`npm run build:web`) is served by the API server itself and needs no proxy.
const http = require('node:http');
const { getDefaultConfig } = require('expo/metro-config');

const config = getDefaultConfig(__dirname);
const target = new URL(process.env.API_PROXY_TARGET || 'http://127.0.0.1:8080');

function proxyApi(req, res) {
  const upstream = http.request(
    {
      hostname: target.hostname,
      port: target.port || 80,
      method: req.method,
      path: req.url,
      headers: { ...req.headers, host: target.host },
    },
    (answer) => {
      res.writeHead(answer.statusCode || 502, answer.headers);
      answer.pipe(res);
    },
  );
  upstream.on('error', (e) => {
    if (res.headersSent) return res.destroy(e);
    res.writeHead(502, { 'Content-Type': 'application/json' });
    res.end(
      JSON.stringify({
        error: {
          code: 'internal',
          message: `The API server at ${target.origin} does not answer (${e.code || e.message}); start it with npm start`,
        },
      }),
    );
  });
  req.pipe(upstream);
}

const enhance = config.server.enhanceMiddleware;
config.server.enhanceMiddleware = (middleware, server) => {
  const inner = enhance ? enhance(middleware, server) : middleware;
  return (req, res, next) => {
    if (req.url === '/api' || (req.url && req.url.startsWith('/api/'))) return proxyApi(req, res);
    return inner(req, res, next);
  };
};

module.exports = config;
