import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Page } from 'playwright-core'
import { launchBrowser, shot, signInThroughForm as signIn, watchPageErrors as watch } from '../support/browser'
import { startTestServer } from '../support/test-server'
import { signIn as apiSignIn } from '../support/test-runtime'
import { acct, insertFinishedRun, planFixture } from '../api/plans-fixtures'
import { fixtureSummary } from '../unit/plans-fixtures'

// Issue 15.11: an empty run list says so; saved scenarios can be edited and deleted with a notice; the gas's own
// hazards (pyrophoric silane, dense and oxygen-displacing argon) show on the result, not only the generic caution.
describe('small things', () => {
  let server: Awaited<ReturnType<typeof startTestServer>>
  let browser: Browser
  let fx: Awaited<ReturnType<typeof planFixture>>
  let scenarioId: number
  let silaneRun: number
  let argonRun: number

  beforeAll(async () => {
    server = await startTestServer()
    browser = await launchBrowser()
    fx = await planFixture(server.rt)
    const officer = await apiSignIn(server.rt, acct('ehs_officer').email, acct('ehs_officer').password)
    scenarioId = (await officer.post(`/api/floors/${fx.floor2Id}/scenarios`).send({ name: 'Valve leak', sourceIds: ['cyl'], durationS: 600, cellM: 1 }).expect(201)).body.id
    const gas = (id: string, name: string, m: number, flags: Partial<{ asphyxiant: boolean; pyrophoric: boolean }>) =>
      fixtureSummary({ gas: { id, name, asphyxiant: false, flammable: false, pyrophoric: false, molarMassGMol: m, ...flags } })
    silaneRun = (await insertFinishedRun(server.rt, { orgId: fx.orgId, floorId: fx.floorId, userId: fx.officerId, label: 'Silane line', summary: gas('SiH4', 'Silane', 32.1, { pyrophoric: true }) })).id
    argonRun = (await insertFinishedRun(server.rt, { orgId: fx.orgId, floorId: fx.floorId, userId: fx.officerId, label: 'Argon dewar', summary: gas('Ar', 'Argon', 39.95, { asphyxiant: true }) })).id
  })
  afterAll(async () => {
    await browser?.close()
    await server?.close()
  })
  const lastNotice = (page: Page) => page.locator('.q-notification').last().textContent()

  it('empty runs say so; a saved scenario is edited and deleted, each with a notice', async () => {
    const page = await (await browser.newContext({ viewport: { width: 1366, height: 768 } })).newPage()
    const problems = watch(page)
    await page.goto(`${server.url}/scenarios?floor=${fx.floor2Id}`)
    await signIn(page, acct('ehs_officer').email, acct('ehs_officer').password)
    await expect.poll(() => page.getByTestId('no-runs').textContent()).toMatch(/No run on this floor yet/)

    await page.getByTestId(`edit-scenario-${scenarioId}`).click()
    await expect.poll(() => page.getByLabel('Name', { exact: true }).inputValue()).toBe('Valve leak')
    await page.getByLabel('Name', { exact: true }).fill('Valve leak, 20 min')
    await page.getByLabel('Duration, minutes').fill('20')
    await page.getByRole('button', { name: 'Save changes' }).click()
    await expect.poll(() => lastNotice(page)).toMatch(/Changes to “Valve leak, 20 min” saved/)
    await expect.poll(() => page.getByTestId('scenario-item').textContent()).toMatch(/Valve leak, 20 min[\s\S]*20 min/)
    const listed = await page.evaluate(async (id) => (await (await fetch(`/api/floors/${id}/scenarios`)).json()).scenarios, fx.floor2Id)
    expect(listed).toHaveLength(1)
    expect(listed[0].config.durationS).toBe(1200)
    await shot(page, 'ui-small-scenario-edited')

    await page.getByTestId(`delete-scenario-${scenarioId}`).click()
    await page.getByRole('button', { name: 'Delete the scenario' }).click()
    await expect.poll(() => lastNotice(page)).toMatch(/Scenario “Valve leak, 20 min” deleted/)
    await expect.poll(() => page.getByTestId('scenario-item').count()).toBe(0)
    expect(problems).toEqual([])
  })

  it('a silane result names its pyrophoric hazard and an argon result its pooling and oxygen displacement, folded banner or not', async () => {
    const page = await (await browser.newContext({ viewport: { width: 1366, height: 768 } })).newPage()
    await page.goto(`${server.url}/runs/${silaneRun}`)
    await signIn(page, acct('ehs_officer').email, acct('ehs_officer').password)
    await expect.poll(() => page.getByTestId('caution-gas-lines').textContent()).toMatch(/Silane can ignite on contact with air/)
    await page.goto(`${server.url}/runs/${argonRun}`)
    await expect.poll(() => page.getByTestId('caution-gas-lines').textContent()).toMatch(/Argon is about 1\.4 times as dense as air[\s\S]*Argon displaces oxygen/)
    await shot(page, 'ui-small-argon-caution')
  })
})
