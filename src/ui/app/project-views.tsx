import type { ComponentType } from 'react';
import { AgreementView } from '../features/agreement/AgreementView';
import { dashboardWorkerWarm } from '../features/agreement/dashboard-worker';
import { CorpusView } from '../features/corpus/CorpusView';
import { ExportView } from '../features/export/ExportView';
import { demoLoad } from '../features/import/demo-load';
import { ImportView } from '../features/import/ImportView';
import { LabelView } from '../features/label/LabelView';
import { MistakesView } from '../features/mistakes/MistakesView';
import { ModelView } from '../features/model/ModelView';
import { OverviewView } from '../features/overview/OverviewView';
import { ProfileBadge } from '../features/profile/ProfileBadge';
import { ProfileChooser } from '../features/profile/ProfileChooser';
import { ResolveView } from '../features/resolve/ResolveView';
import { RulesView } from '../features/rules/RulesView';
import { SchemaView } from '../features/schema/SchemaView';
import { RestoreBackup } from '../features/settings/RestoreBackup';
import { SettingsView } from '../features/settings/SettingsView';
import { PackOpen } from '../features/team/PackOpen';
import { TeamView } from '../features/team/TeamView';

/** The per-project screens, composed here so features never import each other. */
export interface ProjectViewProps {
  projectId: number;
}

export const projectViews: {
  overview: ComponentType<ProjectViewProps>;
  corpus: ComponentType<ProjectViewProps>;
  label: ComponentType<ProjectViewProps>;
  agreement: ComponentType<ProjectViewProps>;
  resolve: ComponentType<ProjectViewProps>;
  rules: ComponentType<ProjectViewProps>;
  mistakes: ComponentType<ProjectViewProps>;
  model: ComponentType<ProjectViewProps>;
  schema: ComponentType<ProjectViewProps>;
  import: ComponentType<ProjectViewProps>;
  export: ComponentType<ProjectViewProps>;
  team: ComponentType<ProjectViewProps>;
  settings: ComponentType<ProjectViewProps>;
  demoLoad: (() => Promise<number>) | undefined;
  restore: ComponentType<{ onOpen: (projectId: number) => void }>;
  /** Opening a pack file from the lead, on the project list. */
  packOpen: ComponentType<{ onOpen: (projectId: number) => void }>;
  /** Who is labelling at this browser, shown in the header on every screen. */
  profile: ComponentType;
  /** Called when a project opens: workers a first look at its figures needs are started meanwhile. */
  projectWarm: () => void;
  /** Choosing who labels, where a screen needs a profile first (the label screen). */
  profileChooser: ComponentType<{ onChosen?: () => void }>;
} = {
  projectWarm: dashboardWorkerWarm,
  overview: OverviewView,
  corpus: CorpusView,
  label: LabelView,
  agreement: AgreementView,
  resolve: ResolveView,
  rules: RulesView,
  mistakes: MistakesView,
  model: ModelView,
  schema: SchemaView,
  import: ImportView,
  export: ExportView,
  team: TeamView,
  settings: SettingsView,
  demoLoad,
  restore: RestoreBackup,
  packOpen: PackOpen,
  profile: ProfileBadge,
  profileChooser: ProfileChooser,
};
