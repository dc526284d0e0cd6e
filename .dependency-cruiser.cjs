// Import boundaries, checked by `npm run lint` (depcruise; the apps are cruised from their own folder so their
// tsconfig paths resolve `@/`). See DEVELOPERS.md, "Boundaries".
// An api domain is a folder under api/src that owns tables or rules; the folders below are shared plumbing that any
// domain may import directly: common/ (guards, errors, http helpers), config/, database/ (data source, migrations,
// seed), and the adapters jobs/ (queue), mail/ (SMTP), payments/ (provider SDK), rate-limit/, health/, openapi/, bench/.
const PLUMBING = 'common|config|database|jobs|mail|payments|rate-limit|health|openapi|bench';

/** @type {import('dependency-cruiser').IConfiguration} */
module.exports = {
  forbidden: [
    {
      name: 'api-domain-deep-import',
      comment: "A domain reaches another domain only through that domain's index.ts.",
      severity: 'error',
      // Unit tests may set up with another domain's test fixtures.
      from: { path: `^api/src/(?!(?:${PLUMBING})/)([^/]+)/`, pathNot: '\\.spec\\.ts$' },
      to: {
        path: `^api/src/(?!(?:${PLUMBING})/)([^/]+)/`,
        pathNot: ['^api/src/$1/', '^api/src/[^/]+/index\\.ts$'],
      },
    },
    {
      name: 'api-common-imports-a-domain',
      comment: 'common/ is shared by every domain and imports none of them.',
      severity: 'error',
      from: { path: '^api/src/common/' },
      to: { path: `^api/src/(?!(?:common|config)/)[^/]+/` },
    },
    {
      name: 'app-feature-imports-another-feature',
      comment:
        'A feature never imports another feature; routes in src/app compose them, shared code lives in src/lib or src/components.',
      severity: 'error',
      from: { path: '^((?:admin/|portal/)?)src/features/([^/]+)/' },
      to: { path: '^$1src/features/', pathNot: '^$1src/features/$2/' },
    },
    {
      name: 'app-shared-imports-a-feature',
      comment: 'Shared components, hooks and libraries sit below the features and import none of them.',
      severity: 'error',
      from: { path: '^((?:admin/|portal/)?)src/(?:components|lib|hooks)/' },
      to: { path: '^$1src/features/' },
    },
  ],
  options: {
    doNotFollow: { path: 'node_modules' },
    exclude: { path: '(^|/)(node_modules|dist)/' },
    tsPreCompilationDeps: true,
    combinedDependencies: false,
    enhancedResolveOptions: {
      exportsFields: ['exports'],
      conditionNames: ['import', 'require', 'node', 'default', 'types'],
      extensions: ['.ts', '.tsx', '.d.ts', '.js', '.mjs', '.cjs'],
    },
  },
};
