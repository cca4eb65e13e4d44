import { Model, DataTypes } from 'sequelize'
import type { InferAttributes, InferCreationAttributes, CreationOptional, Sequelize } from 'sequelize'
import type { MessageKind, MessagePart } from '#shared/types/conversation'

export class ThreadMessage extends Model<InferAttributes<ThreadMessage>, InferCreationAttributes<ThreadMessage>> {
  declare id: CreationOptional<string>
  declare threadId: string
  declare authorId: string | null
  declare kind: CreationOptional<MessageKind>
  declare parts: MessagePart[]
  declare mentionedIds: CreationOptional<string[]>
  declare createdAt: CreationOptional<Date>

  static setup(sequelize: Sequelize) {
    ThreadMessage.init({
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      threadId: { type: DataTypes.UUID, allowNull: false },
      authorId: DataTypes.UUID,
      kind: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'message' },
      parts: { type: DataTypes.JSONB, allowNull: false },
      mentionedIds: { type: DataTypes.ARRAY(DataTypes.UUID), allowNull: false, defaultValue: [] },
      createdAt: DataTypes.DATE,
    }, { sequelize, tableName: 'thread_messages', underscored: true, updatedAt: false })
  }
}
