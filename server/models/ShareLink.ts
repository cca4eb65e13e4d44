import { Model, DataTypes } from 'sequelize'
import type { InferAttributes, InferCreationAttributes, CreationOptional, Sequelize } from 'sequelize'

export class ShareLink extends Model<InferAttributes<ShareLink>, InferCreationAttributes<ShareLink>> {
  declare id: CreationOptional<string>
  declare publicationId: string
  declare investigationId: string
  declare tokenHash: string
  declare expiresAt: Date | null
  declare revokedAt: CreationOptional<Date | null>
  declare revokedBy: CreationOptional<string | null>
  declare createdBy: string
  declare createdAt: CreationOptional<Date>

  static setup(sequelize: Sequelize) {
    ShareLink.init({
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      publicationId: { type: DataTypes.UUID, allowNull: false },
      investigationId: { type: DataTypes.UUID, allowNull: false },
      tokenHash: { type: DataTypes.TEXT, allowNull: false },
      expiresAt: DataTypes.DATE,
      revokedAt: DataTypes.DATE,
      revokedBy: DataTypes.UUID,
      createdBy: { type: DataTypes.UUID, allowNull: false },
      createdAt: DataTypes.DATE,
    }, { sequelize, tableName: 'share_links', underscored: true, updatedAt: false })
  }
}
