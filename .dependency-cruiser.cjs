/**
 * Architecture boundaries, checked by `npm run check:deps` (part of `npm test`).
 * "error" rules hold today and must keep holding; "warn" rules are the target of the layering work
 * (issue: one contract, enforced layers) and list what is still to move.
 */
module.exports = {
  forbidden: [
    { name: 'client-not-server', severity: 'error', comment: 'The browser bundle never imports server code.',
      from: { path: '^src/' }, to: { path: '^server/' } },
    { name: 'server-not-client', severity: 'error', comment: 'The server never imports Vue code.',
      from: { path: '^server/' }, to: { path: '^src/' } },
    { name: 'shared-stays-shared', severity: 'error', comment: 'shared/ is used by both sides, so it imports neither.',
      from: { path: '^shared/' }, to: { path: '^(src|server)/' } },
    { name: 'engine-is-pure', severity: 'error',
      comment: 'The engine imports only its own folder and the pure libraries gases, geometry and units in shared/.',
      from: { path: '^shared/engine/' },
      to: { path: '^shared/', pathNot: '^shared/(engine|gases|geometry|units)/' } },
    { name: 'engine-no-node-io', severity: 'error', comment: 'The engine runs in a browser, a worker thread and the CLI: no I/O.',
      from: { path: '^shared/engine/' }, to: { dependencyTypes: ['core'] } },
    { name: 'repositories-below-services', severity: 'error', comment: 'Repositories hold SQL only; they never call services or routes.',
      from: { path: '^server/repositories/' }, to: { path: '^server/(services|routes)/' } },
    { name: 'services-below-routes', severity: 'error', comment: 'Routes call services, never the other way.',
      from: { path: '^server/services/' }, to: { path: '^server/routes/' } },
    { name: 'pages-through-stores', severity: 'warn', comment: 'Pages reach the API through stores/composables (src/pages/README.md).',
      from: { path: '^src/pages/' }, to: { path: '^src/api/' } },
    { name: 'services-not-http', severity: 'error', comment: 'Services take plain inputs; errors, the actor and role checks live in server/domain/.',
      from: { path: '^server/(services|repositories|jobs|seed|domain)/' }, to: { path: '^server/http/' } },
    { name: 'services-plain-io', severity: 'error', comment: 'Services take plain inputs and return data or bytes: no Express or multer below the routes.',
      from: { path: '^server/(services|repositories|jobs|seed|domain)/' }, to: { path: 'node_modules/(express|multer)/' } },
    { name: 'no-server-cycles', severity: 'error', comment: 'No import cycles on the server or in shared/.',
      from: { path: '^(server|shared)/' }, to: { circular: true } },
    { name: 'no-cycles', severity: 'warn', from: { pathNot: '^(server|shared)/' }, to: { circular: true } },
  ],
  options: {
    doNotFollow: { path: 'node_modules' },
    exclude: { path: '^(node_modules|dist|tests/artifacts)' },
    tsPreCompilationDeps: true,
    tsConfig: { fileName: 'tsconfig.json' },
    enhancedResolveOptions: { extensions: ['.ts', '.vue', '.js', '.mjs'] },
  },
}
