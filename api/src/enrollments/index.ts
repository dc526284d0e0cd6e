// The enrollments domain's public face: other domains import from this file only, never from the files behind it
// (checked by `npm run lint`, .dependency-cruiser.cjs). Other domains read enrollments through reporting/.
export * from './enrollment.exception';
export * from './enrollments.module';
export { RANDOMIZED_STATUSES } from './enrollment-lookup';
