import { Foundation1764615600000 } from './1764615600000-foundation';
import { Wells1764616000000 } from './1764616000000-wells';
import { Records1764617000000 } from './1764617000000-records';
import { Basemaps1764618000000 } from './1764618000000-basemaps';
import { Fits1764619000000 } from './1764619000000-fits';
import { MapVersions1764620000000 } from './1764620000000-map-versions';
import { MailOutbox1764621000000 } from './1764621000000-mail-outbox';
import { OutlinesSketches1764623000000 } from './1764623000000-outlines-sketches';
import { ViewerLinks1764624000000 } from './1764624000000-viewer-links';
import { WellIntakeRadius1764625000000 } from './1764625000000-well-intake-radius';
import { FitFlagAnswers1764626000000 } from './1764626000000-fit-flag-answers';
import { FitModel1764627000000 } from './1764627000000-fit-model';

/** Every committed migration, oldest first. */
export const migrations = [Foundation1764615600000, Wells1764616000000, Records1764617000000, Basemaps1764618000000, Fits1764619000000, MapVersions1764620000000, MailOutbox1764621000000, OutlinesSketches1764623000000, ViewerLinks1764624000000, WellIntakeRadius1764625000000, FitFlagAnswers1764626000000, FitModel1764627000000];
