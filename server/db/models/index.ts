// Every model is initialised here and every association is declared here, in one place.
import { DataTypes, Model, type Sequelize } from 'sequelize';
import { AccountToken, initAccountToken } from './account-token';
import { AuditEvent, initAuditEvent } from './audit-event';
import { Build, initBuild } from './build';
import { CameraBody, initCameraBody } from './camera-body';
import { ContentFlag, initEvidence, Rating, ReportPhoto, SetReport } from './evidence';
import { initKits, Kit, KitItem, KitShare } from './kit';
import { initMailMessage, MailMessage } from './mail-message';
import { initNotice, Notice } from './notice';
import { initPart, Part } from './part';
import { initPartFile, PartFile } from './part-file';
import { initPartRevision, PartRevision } from './part-revision';
import { initPriceSheet, PriceSheet } from './price-sheet';
import { initPrinter, Printer } from './printer';
import { initRecipe, Recipe } from './recipe';
import { initSession, Session } from './session';
import { initUser, User } from './user';
import { initWanted, WantedAnswer, WantedPhoto, WantedRequest } from './wanted';
import { ClientKey, initClientKey } from './client-key';
import { initKitRecall, KitRecall } from './kit-recall';
import { initNoticePreference, NoticePreference } from './notice-preference';

export type { AuditAction } from './audit-event';
export { ContentFlag, Rating, ReportPhoto, SetReport };
export { Kit, KitItem, KitShare, PriceSheet, Printer };
export { Build, WantedAnswer, WantedPhoto, WantedRequest };
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
  initPriceSheet(sequelize);
  initKits(sequelize);
  initBuild(sequelize);
  initWanted(sequelize);
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
}
