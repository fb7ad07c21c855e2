// The model registry: every model is initialised here and its associations declared once.
import type { Sequelize } from 'sequelize';
import { User } from './User';
import { OutboxMail } from './OutboxMail';
import { Instrument } from './Instrument';
import { InstrumentCalibration } from './InstrumentCalibration';
import { Supplier } from './Supplier';
import { Part } from './Part';
import { PurchaseOrder } from './PurchaseOrder';
import { PurchaseOrderLine } from './PurchaseOrderLine';
import { Shipment } from './Shipment';
import { Lot } from './Lot';
import { Piece } from './Piece';
import { Location } from './Location';
import { StockMove } from './StockMove';
import { Attachment } from './Attachment';
import { ExportJob } from './ExportJob';
import { initInspectionModels } from './inspection';
import { initAuthModels } from './auth';
import { initNonconformanceModels } from './nonconformance';
import { initDeviationModels } from './deviation';
import { initCorrectiveActionModels } from './correctiveAction';

export function initModels(sequelize: Sequelize) {
  User.initModel(sequelize);
  OutboxMail.initModel(sequelize);
  Instrument.initModel(sequelize);
  InstrumentCalibration.initModel(sequelize);
  ExportJob.initModel(sequelize);
  initReceivingModels(sequelize);
  const inspection = initInspectionModels(sequelize);
  const auth = initAuthModels(sequelize);
  const nonconformance = initNonconformanceModels(sequelize);
  const deviations = initDeviationModels(sequelize);
  const correctiveActions = initCorrectiveActionModels(sequelize);
  return {
    ...auth,
    ...nonconformance,
    ...deviations,
    ...correctiveActions,
    User,
    OutboxMail,
    Instrument,
    InstrumentCalibration,
    ExportJob,
    Supplier,
    Part,
    PurchaseOrder,
    PurchaseOrderLine,
    Shipment,
    Lot,
    Piece,
    Location,
    StockMove,
    Attachment,
    ...inspection,
  };
}

/** Purchasing, receiving and stock (migration 0101). */
function initReceivingModels(sequelize: Sequelize) {
  for (const model of [Supplier, Part, PurchaseOrder, PurchaseOrderLine, Shipment, Lot, Piece, Location, StockMove, Attachment]) model.initModel(sequelize);
  Supplier.belongsTo(User, { as: 'owner', foreignKey: 'ownerId' });
  PurchaseOrder.belongsTo(Supplier, { as: 'supplier', foreignKey: 'supplierId' });
  PurchaseOrder.belongsTo(User, { as: 'buyer', foreignKey: 'buyerId' });
  PurchaseOrder.hasMany(PurchaseOrderLine, { as: 'lines', foreignKey: 'purchaseOrderId' });
  PurchaseOrderLine.belongsTo(PurchaseOrder, { as: 'purchaseOrder', foreignKey: 'purchaseOrderId' });
  PurchaseOrderLine.belongsTo(Part, { as: 'part', foreignKey: 'partId' });
  Shipment.belongsTo(PurchaseOrder, { as: 'purchaseOrder', foreignKey: 'purchaseOrderId' });
  Shipment.belongsTo(User, { as: 'receiver', foreignKey: 'receivedBy' });
  Lot.belongsTo(Shipment, { as: 'shipment', foreignKey: 'shipmentId' });
  Lot.belongsTo(PurchaseOrderLine, { as: 'line', foreignKey: 'poLineId' });
  Lot.belongsTo(Part, { as: 'part', foreignKey: 'partId' });
  Lot.hasMany(Piece, { as: 'pieces', foreignKey: 'lotId' });
  Piece.belongsTo(Lot, { as: 'lot', foreignKey: 'lotId' });
}

export {
  User,
  OutboxMail,
  Instrument,
  InstrumentCalibration,
  ExportJob,
  Supplier,
  Part,
  PurchaseOrder,
  PurchaseOrderLine,
  Shipment,
  Lot,
  Piece,
  Location,
  StockMove,
  Attachment,
};
export type { OutboxAttachment } from './OutboxMail';
export { Session, PasswordResetToken, type SessionEndReason } from './auth';
export {
  LotInspection,
  SamplePiece,
  SwitchingStateRecord,
  SwitchingEvent,
  MeasurementFile,
  Reading,
  PieceResult,
  DispositionRecord,
  LotDocument,
} from './inspection';
export {
  RecordCounter,
  DefectCode,
  Nonconformance,
  NonconformanceDefect,
  NonconformancePiece,
  NcrDisposition,
  NcrDispositionPiece,
  VendorReturn,
  type NcrOrigin,
  type NcrStatus,
  type NcrDecision,
} from './nonconformance';
export { Deviation, DeviationApproval, DeviationUse, type ApprovalSlot } from './deviation';
export { CorrectiveAction, CorrectiveActionLink, CorrectiveActionResponse, CorrectiveActionAttachment, type CorrectiveActionStatus } from './correctiveAction';
