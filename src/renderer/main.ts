// Renderer entry. The screens come with the desktop issue; until then this shows what the build contains.
const app = document.getElementById('app');
if (app !== null) {
  const heading = document.createElement('h1');
  heading.textContent = 'Tauwell';
  const note = document.createElement('p');
  note.textContent = 'The decline engine is available from the command line: run `npx tauwell --help`.';
  app.append(heading, note);
}
