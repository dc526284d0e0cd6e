// The studies domain's public face: other domains import from this file only, never from the files behind it
// (checked by `npm run lint`, .dependency-cruiser.cjs).
export * from './dto/screening.dto';
export * from './entities/condition.entity';
export * from './entities/study.entity';
export * from './studies.module';
export * from './studies.service';
export * from './study-access.guard';
