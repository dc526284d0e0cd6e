// The auth domain's public face: other domains import from this file only, never from the files behind it
// (checked by `npm run lint`, .dependency-cruiser.cjs).
export * from './auth.service';
export * from './auth.module';
