// Every model is initialised here and every association is declared here, in one place.
import { DataTypes, Model, type Sequelize } from 'sequelize';
import { logShelfChanges } from '../shelf-changes';
import { AccountToken, initAccountToken } from './account-token';
import { AuditEvent, initAuditEvent } from './audit-event';
import { Build, initBuild } from './build';
import { CameraBody, initCameraBody } from './camera-body';
import { Crew, CrewInvitation, CrewMember, initCrews, KitCrewShare } from './crew';
import { ContentFlag, initEvidence, Rating, ReportPhoto, SetReport } from './evidence';
import { initKits, Kit, KitItem, KitShare } from './kit';
import { initMailMessage, MailMessage } from './mail-message';
import { initNotice, Notice } from './notice';
import { initPart, Part } from './part';
import { initPartFile, PartFile } from './part-file';
import { initPartRevision, PartRevision } from './part-revision';
import { initPriceSheet, PriceSheet } from './price-sheet';
import { initPrinter, Printer } from './printer';
import { initPrinterCalibration, PrinterCalibration } from './printer-calibration';
import { initPrintRequests, PaymentEvent, PrintRequest, PrintRequestEvent } from './print-request';
import { initRecipe, Recipe } from './recipe';
import { initSession, Session } from './session';
import { initUser, User } from './user';
import { initWanted, WantedAnswer, WantedPhoto, WantedRequest } from './wanted';
import { ClientKey, initClientKey } from './client-key';
import { initKitRecall, KitRecall } from './kit-recall';
import { initNoticePreference, NoticePreference } from './notice-preference';

export type { AuditAction } from './audit-event';
export { ContentFlag, Rating, ReportPhoto, SetReport };
export { Kit, KitItem, KitShare, PriceSheet, Printer, PrinterCalibration };
export type { MadeGeometry } from './kit';
export { Build, WantedAnswer, WantedPhoto, WantedRequest };
export { PaymentEvent, PrintRequest, PrintRequestEvent };
export { Crew, CrewInvitation, CrewMember, KitCrewShare };
export { ClientKey, KitRecall, NoticePreference };
export { AccountToken, AuditEvent, CameraBody, MailMessage, Notice, Part, PartFile, PartRevision, Recipe, Session, User };

/** Join rows: which camera bodies a revision fits, which files a revision shows (in order). */
export class RevisionBody extends Model {}
export class RevisionFile extends Model {
  declare revisionId: number;
  declare fileId: number;
  declare position: number;
}

export function initModels(sequelize: Sequelize) {
  initUser(sequelize);
  initSession(sequelize);
  initCameraBody(sequelize);
  initPart(sequelize);
  initPartRevision(sequelize);
  initRecipe(sequelize);
  initPartFile(sequelize);
  initMailMessage(sequelize);
  initAccountToken(sequelize);
  initAuditEvent(sequelize);
  initEvidence(sequelize);
  initNotice(sequelize);
  initPrinter(sequelize);
  initPrinterCalibration(sequelize);
  initPriceSheet(sequelize);
  initKits(sequelize);
  initBuild(sequelize);
  initWanted(sequelize);
  initPrintRequests(sequelize);
  initCrews(sequelize);
  initNoticePreference(sequelize);
  initKitRecall(sequelize);
  initClientKey(sequelize);
  RevisionBody.init(
    {
      revisionId: { type: DataTypes.INTEGER.UNSIGNED, primaryKey: true },
      bodyId: { type: DataTypes.INTEGER.UNSIGNED, primaryKey: true },
    },
    { sequelize, tableName: 'revision_bodies', modelName: 'RevisionBody', timestamps: false },
  );
  RevisionFile.init(
    {
      revisionId: { type: DataTypes.INTEGER.UNSIGNED, primaryKey: true },
      fileId: { type: DataTypes.INTEGER.UNSIGNED, primaryKey: true },
      position: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
    },
    { sequelize, tableName: 'revision_files', modelName: 'RevisionFile', timestamps: false },
  );

  // what search shows: each write also adds a shelf_changes row that every instance polls
  // (only what can reach the published shelf: a submission, a draft's edits and its files do not)
  const shown = (row: Model, changed: string[]) => row.get('status') === 'published' || changed.includes('status');
  logShelfChanges([
    { model: Part, kind: 'index', skipCreate: true, only: ['status', 'publishedRevisionId', 'publishedAt', 'crewId', 'slug'] },
    { model: PartRevision, kind: 'index', skipCreate: true, when: shown },
    { model: PartFile, kind: 'index', skipCreate: true, only: ['processing', 'renderStatus'] },
    { model: RevisionFile, kind: 'index', skipCreate: true },
    { model: CameraBody, kind: 'index' },
    { model: Rating, kind: 'ranking' },
    { model: SetReport, kind: 'ranking' },
    { model: ContentFlag, kind: 'ranking' },
  ]);

  Part.belongsTo(User, { as: 'author', foreignKey: 'authorId' });
  AccountToken.belongsTo(User, { as: 'user', foreignKey: 'userId' });
  AuditEvent.belongsTo(User, { as: 'actor', foreignKey: 'actorId' });
  Rating.belongsTo(User, { as: 'user', foreignKey: 'userId' });
  SetReport.belongsTo(User, { as: 'user', foreignKey: 'userId' });
  SetReport.hasMany(ReportPhoto, { as: 'photos', foreignKey: 'reportId' });
  Part.belongsTo(Part, { as: 'parent', foreignKey: 'parentId' });
  Part.hasMany(Part, { as: 'adaptations', foreignKey: 'parentId' });
  Part.belongsTo(PartRevision, { as: 'publishedRevision', foreignKey: 'publishedRevisionId', constraints: false });
  Part.belongsTo(PartRevision, { as: 'latestRevision', foreignKey: 'latestRevisionId', constraints: false });
  Part.hasMany(PartRevision, { as: 'revisions', foreignKey: 'partId' });
  Part.hasMany(PartFile, { as: 'allFiles', foreignKey: 'partId' });
  PartRevision.belongsTo(Part, { as: 'part', foreignKey: 'partId' });
  PartRevision.hasMany(Recipe, { as: 'recipes', foreignKey: 'revisionId' });
  PartRevision.belongsToMany(CameraBody, { as: 'bodies', through: RevisionBody, foreignKey: 'revisionId', otherKey: 'bodyId' });
  PartRevision.belongsToMany(PartFile, { as: 'files', through: RevisionFile, foreignKey: 'revisionId', otherKey: 'fileId' });
  Printer.belongsTo(User, { as: 'owner', foreignKey: 'ownerId' });
  Printer.hasMany(PrinterCalibration, { as: 'calibrations', foreignKey: 'printerId' });
  Kit.belongsTo(User, { as: 'owner', foreignKey: 'ownerId' });
  Kit.hasMany(KitItem, { as: 'items', foreignKey: 'kitId' });
  Kit.hasMany(KitShare, { as: 'shares', foreignKey: 'kitId' });
  KitShare.belongsTo(User, { as: 'user', foreignKey: 'userId' });
  KitItem.belongsTo(Part, { as: 'part', foreignKey: 'partId' });
  KitItem.belongsTo(Recipe, { as: 'recipe', foreignKey: 'recipeId', constraints: false });
  KitItem.belongsTo(Printer, { as: 'printer', foreignKey: 'printerId', constraints: false });
  Build.belongsTo(User, { as: 'owner', foreignKey: 'ownerId' });
  Build.belongsTo(CameraBody, { as: 'body', foreignKey: 'bodyId', constraints: false });
  WantedRequest.belongsTo(User, { as: 'author', foreignKey: 'authorId' });
  WantedRequest.belongsTo(User, { as: 'closer', foreignKey: 'closedBy', constraints: false });
  WantedRequest.belongsTo(CameraBody, { as: 'body', foreignKey: 'bodyId', constraints: false });
  WantedRequest.hasMany(WantedPhoto, { as: 'photos', foreignKey: 'requestId' });
  WantedRequest.hasMany(WantedAnswer, { as: 'answers', foreignKey: 'requestId' });
  WantedAnswer.belongsTo(WantedRequest, { as: 'request', foreignKey: 'requestId' });
  WantedAnswer.belongsTo(User, { as: 'user', foreignKey: 'userId' });
  WantedAnswer.belongsTo(Part, { as: 'part', foreignKey: 'partId' });
  PrintRequest.belongsTo(User, { as: 'requester', foreignKey: 'requesterId' });
  PrintRequest.belongsTo(User, { as: 'owner', foreignKey: 'ownerId' });
  PrintRequest.hasMany(PrintRequestEvent, { as: 'events', foreignKey: 'requestId' });
  PrintRequestEvent.belongsTo(User, { as: 'actor', foreignKey: 'actorId', constraints: false });
  Crew.hasMany(CrewMember, { as: 'members', foreignKey: 'crewId' });
  CrewMember.belongsTo(Crew, { as: 'crew', foreignKey: 'crewId' });
  CrewMember.belongsTo(User, { as: 'user', foreignKey: 'userId' });
  CrewInvitation.belongsTo(Crew, { as: 'crew', foreignKey: 'crewId' });
  CrewInvitation.belongsTo(User, { as: 'inviter', foreignKey: 'invitedBy', constraints: false });
  Kit.hasMany(KitCrewShare, { as: 'crewShares', foreignKey: 'kitId' });
  KitCrewShare.belongsTo(Crew, { as: 'crew', foreignKey: 'crewId' });
}
