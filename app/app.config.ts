export default defineAppConfig({
  caution: 'A digit test is a screen, not proof: a deviation says "look here", never "fraud". Check the records, ask the people involved, and take it to legal review before naming anyone.',
})
