import { stepWindows, type StepListDto, type StepWindow } from '../steps';
import type { EnrollmentEntity } from './entities/enrollment.entity';

/** Each step's window for one enrollment: windows exist once someone is assigned; before that, none. */
export function windowsFor(
  enrollment: EnrollmentEntity,
  stepList: StepListDto,
  done: ReadonlyMap<string, Date>,
): Array<StepWindow | undefined> {
  if (!enrollment.assignedAt) return stepList.items.map(() => undefined);
  return stepWindows(stepList.items, enrollment.assignedAt, done);
}
