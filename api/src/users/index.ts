// The users domain's public face: other domains import from this file only, never from the files behind it
// (checked by `npm run lint`, .dependency-cruiser.cjs).
export * from './dto/user.dto';
export * from './entities/user.entity';
export * from './users.module';
export * from './users.service';
export * from './lab-settings.service';
