/**
 * Architecture boundaries, checked by `npm run lint` (dependency-cruiser). Folders say where code
 * runs; arrows point one way: app and components → lib/server → lib/shared → the pure core
 * (lib/design, lib/criteria) → nothing; lib/client → lib/shared and the core; db/ → lib/shared and
 * the core. No import cycles anywhere. tests/unit/architecture/boundaries.test.ts proves a breach fails.
 * @type {import('dependency-cruiser').IConfiguration}
 */
module.exports = {
  forbidden: [
    {
      name: 'no-cycle',
      severity: 'error',
      comment: 'An import cycle: split the shared part into a module both can import.',
      from: {},
      to: { circular: true },
    },
    {
      name: 'core-imports-nothing',
      severity: 'error',
      comment: 'The numerical core (lib/design, lib/criteria) is pure: no framework, database, DOM or other project code.',
      from: { path: '^lib/(design|criteria)/' },
      to: { pathNot: ['^lib/(design|criteria)/'] },
    },
    {
      name: 'core-halves-through-index',
      severity: 'error',
      comment: 'lib/criteria and lib/design use each other only through their public index.ts.',
      from: { path: '^lib/(design|criteria)/' },
      to: { path: '^lib/(design|criteria)/', pathNot: ['^lib/(design|criteria)/index\\.ts$', '^lib/$1/'] },
    },
    {
      name: 'shared-is-pure',
      severity: 'error',
      comment: 'lib/shared runs in the browser and on the server: it imports only the core and itself.',
      from: { path: '^lib/shared/' },
      to: { path: '^(lib/(server|client)|db|app|components|scripts)/' },
    },
    {
      name: 'client-not-server',
      severity: 'error',
      comment:
        'lib/client runs in the browser: it imports lib/shared and the core, never server code or the database. ' +
        'A reply type declared beside the service that builds it may be imported with `import type` (erased, so no server code ships).',
      from: { path: '^lib/client/' },
      to: { path: '^(lib/server|db|app|scripts)/', dependencyTypesNot: ['type-only'] },
    },
    {
      name: 'server-not-app',
      severity: 'error',
      comment: 'lib/server serves app/; it never imports pages, route handlers, components or browser code.',
      from: { path: '^lib/server/' },
      to: { path: '^(app|components|lib/client|scripts)/' },
    },
    {
      name: 'services-below-http',
      severity: 'error',
      comment: 'Services are called by the HTTP layer, never the other way round.',
      from: { path: '^lib/server/(services|auth|mail|figures|jobs)/' },
      to: { path: '^lib/server/http/' },
    },
    {
      name: 'jobs-below-services',
      severity: 'error',
      comment: 'The worker pool (lib/server/jobs) computes; the services that store its results call it.',
      from: { path: '^lib/server/jobs/' },
      to: { path: '^(lib/server/(services|auth|mail|figures)|db)/' },
    },
    {
      name: 'db-below-services',
      severity: 'error',
      comment:
        'The database layer (models, migrations, seeders) imports lib/shared and the core; of the server code only its ' +
        'settings (lib/server/env.ts) and the link-token hash the demo seeder stores (lib/server/auth/tokens.ts).',
      from: { path: '^db/' },
      to: { path: '^(lib/server|lib/client|app|components|scripts)/', pathNot: ['^lib/server/env\\.ts$', '^lib/server/auth/tokens\\.ts$'] },
    },
    {
      name: 'no-scripts-from-code',
      severity: 'error',
      comment: 'scripts/ start the app and its services; the app never imports them.',
      from: { path: '^(lib|app|components|db)/' },
      to: { path: '^scripts/' },
    },
  ],
  options: {
    doNotFollow: { path: 'node_modules' },
    exclude: { path: '(^|/)node_modules/|^(\\.next|\\.next-[^/]*|\\.data|tests/artifacts|tests/fixtures|coverage)/' },
    tsPreCompilationDeps: true,
    tsConfig: { fileName: 'tsconfig.json' },
    enhancedResolveOptions: {
      exportsFields: ['exports'],
      conditionNames: ['import', 'require', 'node', 'default', 'types'],
      extensions: ['.ts', '.tsx', '.mjs', '.js', '.mts', '.d.mts', '.json'],
    },
  },
};
