import { Init1796154711035 } from './1796154711035-init.js';
import { Board1796155389029 } from './1796155389029-board.js';
import { Access1796156457410 } from './1796156457410-access.js';
import { Quotes1796156605681 } from './1796156605681-quotes.js';
import { CrewPhone1796157002046 } from './1796157002046-crew-phone.js';
import { Weather1796157225208 } from './1796157225208-weather.js';
import { InspectionPhotos1796166178732 } from './1796166178732-inspection-photos.js';
import { DerivedJobActuals1796166209099 } from './1796166209099-derived-job-actuals.js';
import { WeatherLimits1796166360525 } from './1796166360525-weather-limits.js';
import { AccessCancelledReason1796244607912 } from './1796244607912-access-cancelled-reason.js';
import { AccessHandover1796245028967 } from './1796245028967-access-handover.js';
import { WeatherHoldSettling1796245216000 } from './1796245216000-weather-hold-settling.js';
import { ClientContacts1796245300000 } from './1796245300000-client-contacts.js';
import { AuditEventClockTime1796245400000 } from './1796245400000-audit-event-clock-time.js';

// Listed by class, not globbed: under vitest TypeORM would import the .ts files itself and fail.
export const migrations = [Init1796154711035, Board1796155389029, Access1796156457410, Quotes1796156605681, CrewPhone1796157002046, Weather1796157225208, InspectionPhotos1796166178732, DerivedJobActuals1796166209099, WeatherLimits1796166360525, AccessCancelledReason1796244607912, AccessHandover1796245028967, WeatherHoldSettling1796245216000, ClientContacts1796245300000, AuditEventClockTime1796245400000];
