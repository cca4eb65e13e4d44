import { Model, DataTypes } from 'sequelize'
import type { InferAttributes, InferCreationAttributes, CreationOptional, Sequelize } from 'sequelize'
import type { ClaimStatus } from '#shared/types/investigation'

export class Claim extends Model<InferAttributes<Claim>, InferCreationAttributes<Claim>> {
  declare id: string
  declare investigationId: string
  declare blockId: string
  declare quote: string
  declare supportingBlockIds: string[]
  declare status: CreationOptional<ClaimStatus>
  declare note: CreationOptional<string | null>
  declare createdBy: string
  declare decidedBy: CreationOptional<string | null>
  declare decidedAt: CreationOptional<Date | null>
  declare createdAt: CreationOptional<Date>

  static setup(sequelize: Sequelize) {
    Claim.init({
      // The id the claim's mark carries in the text; it names the claim within its investigation only.
      id: { type: DataTypes.UUID, primaryKey: true },
      investigationId: { type: DataTypes.UUID, allowNull: false, primaryKey: true },
      blockId: { type: DataTypes.UUID, allowNull: false },
      quote: { type: DataTypes.TEXT, allowNull: false },
      supportingBlockIds: { type: DataTypes.ARRAY(DataTypes.UUID), allowNull: false, defaultValue: [] },
      status: { type: DataTypes.ENUM('open', 'verified', 'disputed'), allowNull: false, defaultValue: 'open' },
      note: DataTypes.TEXT,
      createdBy: { type: DataTypes.UUID, allowNull: false },
      decidedBy: DataTypes.UUID,
      decidedAt: DataTypes.DATE,
      createdAt: DataTypes.DATE,
    }, { sequelize, tableName: 'claims', underscored: true, updatedAt: false })
  }
}
