/** The dataset's own partition tables; the name comes from its uuid, never from user input. */
export function partitionNames(datasetId: string) {
  const hex = datasetId.replaceAll('-', '')
  if (!/^[0-9a-f]{32}$/.test(hex)) throw new Error('not a dataset id')
  return { rows: `dataset_rows_${hex}`, digits: `digit_records_${hex}`, cube: `digit_cube_${hex}`, groupValues: `import_group_values_${hex}` }
}

/** SQL that drops every table of a dataset's partitions and of its unfinished import. */
export function dropPartitionsSql(datasetId: string): string {
  return Object.values(partitionNames(datasetId)).map(table => `DROP TABLE IF EXISTS ${table};`).join(' ')
}
