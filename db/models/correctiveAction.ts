// Models of corrective-action requests to suppliers (migration 1051): the request, its response
// links, the supplier's responses and their attached files.
import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

export type CorrectiveActionStatus = 'awaiting-response' | 'responded' | 'accepted' | 'closed';

export class CorrectiveAction extends Model<InferAttributes<CorrectiveAction>, InferCreationAttributes<CorrectiveAction>> {
  declare id: CreationOptional<number>;
  declare number: string;
  declare supplierId: number;
  declare partId: number;
  declare problem: string;
  declare responseDueOn: string;
  declare status: CreationOptional<CorrectiveActionStatus>;
  declare sentTo: string;
  declare requestedBy: number;
  declare requestedAt: CreationOptional<Date>;
  declare acceptedBy: CreationOptional<number | null>;
  declare acceptedAt: CreationOptional<Date | null>;
  declare closedBy: CreationOptional<number | null>;
  declare closedAt: CreationOptional<Date | null>;
  declare effectivenessNote: CreationOptional<string | null>;
  declare lastRemindedAt: CreationOptional<Date | null>;
  declare updatedAt: CreationOptional<Date>;
}

export class CorrectiveActionLink extends Model<InferAttributes<CorrectiveActionLink>, InferCreationAttributes<CorrectiveActionLink>> {
  declare id: CreationOptional<number>;
  declare correctiveActionId: number;
  declare issuedBy: number | null;
  declare issuedAt: Date;
  declare expiresAt: Date;
  declare revokedAt: CreationOptional<Date | null>;
  declare revokedBy: CreationOptional<number | null>;
  declare submittedAt: CreationOptional<Date | null>;
}

export class CorrectiveActionResponse extends Model<InferAttributes<CorrectiveActionResponse>, InferCreationAttributes<CorrectiveActionResponse>> {
  declare id: CreationOptional<number>;
  declare correctiveActionId: number;
  declare linkId: number;
  declare responderName: string;
  declare rootCause: string;
  declare containment: string;
  declare correctiveActions: string;
  declare preventiveActions: string;
  declare containmentOn: string | null;
  declare correctiveDueOn: string;
  declare preventiveDueOn: string | null;
  declare submittedAt: CreationOptional<Date>;
  declare address: string | null;
  declare userAgent: string | null;
  declare review: CreationOptional<'accepted' | 'returned' | null>;
  declare reviewedBy: CreationOptional<number | null>;
  declare reviewedAt: CreationOptional<Date | null>;
  declare reviewNote: CreationOptional<string | null>;
}

export class CorrectiveActionAttachment extends Model<InferAttributes<CorrectiveActionAttachment>, InferCreationAttributes<CorrectiveActionAttachment>> {
  declare id: CreationOptional<number>;
  declare responseId: number;
  declare name: string;
  declare mediaType: string;
  declare size: number;
  declare storageKey: string;
}

export function initCorrectiveActionModels(sequelize: Sequelize) {
  const common = { sequelize, underscored: true, timestamps: false };
  CorrectiveAction.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      number: { type: DataTypes.STRING(20), allowNull: false, unique: true },
      supplierId: { type: DataTypes.INTEGER, allowNull: false },
      partId: { type: DataTypes.INTEGER, allowNull: false },
      problem: { type: DataTypes.TEXT, allowNull: false },
      responseDueOn: { type: DataTypes.DATEONLY, allowNull: false },
      status: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'awaiting-response' },
      sentTo: { type: DataTypes.STRING(254), allowNull: false },
      requestedBy: { type: DataTypes.INTEGER, allowNull: false },
      requestedAt: { type: DataTypes.DATE, defaultValue: DataTypes.NOW },
      acceptedBy: DataTypes.INTEGER,
      acceptedAt: DataTypes.DATE,
      closedBy: DataTypes.INTEGER,
      closedAt: DataTypes.DATE,
      effectivenessNote: DataTypes.TEXT,
      lastRemindedAt: DataTypes.DATE,
      updatedAt: { type: DataTypes.DATE, defaultValue: DataTypes.NOW },
    },
    { ...common, tableName: 'corrective_actions' },
  );
  CorrectiveActionLink.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      correctiveActionId: { type: DataTypes.INTEGER, allowNull: false },
      issuedBy: DataTypes.INTEGER,
      issuedAt: { type: DataTypes.DATE, allowNull: false },
      expiresAt: { type: DataTypes.DATE, allowNull: false },
      revokedAt: DataTypes.DATE,
      revokedBy: DataTypes.INTEGER,
      submittedAt: DataTypes.DATE,
    },
    { ...common, tableName: 'corrective_action_links' },
  );
  CorrectiveActionResponse.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      correctiveActionId: { type: DataTypes.INTEGER, allowNull: false },
      linkId: { type: DataTypes.INTEGER, allowNull: false, unique: true },
      responderName: { type: DataTypes.STRING(120), allowNull: false },
      rootCause: { type: DataTypes.TEXT, allowNull: false },
      containment: { type: DataTypes.TEXT, allowNull: false },
      correctiveActions: { type: DataTypes.TEXT, allowNull: false },
      preventiveActions: { type: DataTypes.TEXT, allowNull: false },
      containmentOn: DataTypes.DATEONLY,
      correctiveDueOn: { type: DataTypes.DATEONLY, allowNull: false },
      preventiveDueOn: DataTypes.DATEONLY,
      submittedAt: { type: DataTypes.DATE, defaultValue: DataTypes.NOW },
      address: DataTypes.STRING(64),
      userAgent: DataTypes.STRING(300),
      review: DataTypes.STRING(10),
      reviewedBy: DataTypes.INTEGER,
      reviewedAt: DataTypes.DATE,
      reviewNote: DataTypes.TEXT,
    },
    { ...common, tableName: 'corrective_action_responses' },
  );
  CorrectiveActionAttachment.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      responseId: { type: DataTypes.INTEGER, allowNull: false },
      name: { type: DataTypes.STRING(255), allowNull: false },
      mediaType: { type: DataTypes.STRING(40), allowNull: false },
      size: { type: DataTypes.INTEGER, allowNull: false },
      storageKey: { type: DataTypes.CHAR(64), allowNull: false },
    },
    { ...common, tableName: 'corrective_action_attachments' },
  );
  return { CorrectiveAction, CorrectiveActionLink, CorrectiveActionResponse, CorrectiveActionAttachment };
}
