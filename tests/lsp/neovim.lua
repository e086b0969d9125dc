-- Neovim's built-in LSP client against `gonogo lsp`, headless (run by tests/lsp.rs).
-- Opens $GONOGO_FILE, waits for the server's diagnostics, asks for a hover on the `bore`
-- measurement and writes what came back to $GONOGO_RESULTS, then quits.
local out = {}
local function finish()
  local f = io.open(os.getenv("GONOGO_RESULTS"), "w")
  f:write(table.concat(out, "\n") .. "\n")
  f:close()
  vim.cmd("qall!")
end

local ok, err = pcall(function()
  vim.cmd("edit " .. vim.fn.fnameescape(os.getenv("GONOGO_FILE")))
  local buf = vim.api.nvim_get_current_buf()
  local config = {
    name = "gonogo",
    cmd = { os.getenv("GONOGO"), "lsp" },
    root_dir = vim.fn.fnamemodify(os.getenv("GONOGO_FILE"), ":h"),
  }
  if vim.lsp.start then
    vim.lsp.start(config) -- Neovim 0.8 and later
  else
    -- Debian 12 packages Neovim 0.7, which has no vim.lsp.start yet
    local id = vim.lsp.start_client(config)
    vim.lsp.buf_attach_client(buf, id)
  end
  table.insert(out, "neovim " .. tostring(vim.version().major) .. "." .. tostring(vim.version().minor))

  local got = vim.wait(30000, function() return #vim.diagnostic.get(buf) > 0 end, 50)
  if not got then table.insert(out, "no diagnostics") end
  for _, d in ipairs(vim.diagnostic.get(buf)) do
    local code = d.code or (d.user_data and d.user_data.lsp and d.user_data.lsp.code)
    table.insert(out, "diagnostic " .. tostring(code) .. " line " .. d.lnum .. ": " .. d.message)
  end

  local line
  for i, text in ipairs(vim.api.nvim_buf_get_lines(buf, 0, -1, false)) do
    if text:find("^measure bore:") then line = i - 1 end
  end
  local params = {
    textDocument = { uri = vim.uri_from_bufnr(buf) },
    position = { line = line, character = 9 },
  }
  local answers = vim.lsp.buf_request_sync(buf, "textDocument/hover", params, 30000) or {}
  for _, answer in pairs(answers) do
    if answer.result then
      table.insert(out, "hover: " .. answer.result.contents.value)
    elseif answer.err then
      table.insert(out, "hover error: " .. vim.inspect(answer.err))
    end
  end
end)
if not ok then table.insert(out, "error: " .. tostring(err)) end
finish()
