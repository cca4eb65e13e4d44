import { Model, DataTypes } from 'sequelize'
import type { InferAttributes, InferCreationAttributes, CreationOptional, Sequelize } from 'sequelize'

export class SignInAttempt extends Model<InferAttributes<SignInAttempt>, InferCreationAttributes<SignInAttempt>> {
  declare id: CreationOptional<string>
  declare email: string
  declare ip: string
  declare succeeded: boolean
  declare createdAt: CreationOptional<Date>

  static setup(sequelize: Sequelize) {
    SignInAttempt.init({
      id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
      email: { type: DataTypes.TEXT, allowNull: false },
      ip: { type: DataTypes.TEXT, allowNull: false },
      succeeded: { type: DataTypes.BOOLEAN, allowNull: false },
      createdAt: DataTypes.DATE,
    }, { sequelize, tableName: 'sign_in_attempts', underscored: true, updatedAt: false })
  }
}
