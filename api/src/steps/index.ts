// The steps domain's public face: other domains import from this file only, never from the files behind it
// (checked by `npm run lint`, .dependency-cruiser.cjs).
export * from './dto/step.dto';
export * from './return-link';
export * from './step-window';
export * from './steps.module';
export * from './steps.service';
