import { Model, DataTypes } from 'sequelize'
import type { InferAttributes, InferCreationAttributes, CreationOptional, ForeignKey, Sequelize } from 'sequelize'
import type { User } from './User'

export class RecoveryCode extends Model<InferAttributes<RecoveryCode>, InferCreationAttributes<RecoveryCode>> {
  declare id: CreationOptional<string>
  declare userId: ForeignKey<User['id']>
  declare codeHash: string
  declare usedAt: CreationOptional<Date | null>

  static setup(sequelize: Sequelize) {
    RecoveryCode.init({
      id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
      userId: { type: DataTypes.UUID, allowNull: false },
      codeHash: { type: DataTypes.TEXT, allowNull: false },
      usedAt: { type: DataTypes.DATE, allowNull: true },
    }, { sequelize, tableName: 'recovery_codes', underscored: true, timestamps: false })
  }
}
