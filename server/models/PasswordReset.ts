import { Model, DataTypes } from 'sequelize'
import type { InferAttributes, InferCreationAttributes, CreationOptional, ForeignKey, Sequelize } from 'sequelize'
import type { User } from './User'

export class PasswordReset extends Model<InferAttributes<PasswordReset>, InferCreationAttributes<PasswordReset>> {
  declare id: CreationOptional<string>
  declare userId: ForeignKey<User['id']>
  declare tokenHash: string
  declare expiresAt: Date
  declare usedAt: CreationOptional<Date | null>
  declare createdAt: CreationOptional<Date>

  static setup(sequelize: Sequelize) {
    PasswordReset.init({
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      userId: { type: DataTypes.UUID, allowNull: false },
      tokenHash: { type: DataTypes.TEXT, allowNull: false, unique: true },
      expiresAt: { type: DataTypes.DATE, allowNull: false },
      usedAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
    }, { sequelize, tableName: 'password_resets', underscored: true, updatedAt: false })
  }
}
